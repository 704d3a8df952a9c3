import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parsePathCsv, parseTracksById, readPathCsv, samplePath } from '../../bridge/calibrate/path.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('path CSV', () => {
  it('reads time_s,x_m,y_m in any order and interpolates linearly', () => {
    const p = parsePathCsv('y_m,note,time_s,x_m\n0,a,0,0\n2,b,2,1\n2,c,4,1\n', 't');
    expect(p).toHaveLength(3);
    expect(samplePath(p, 1)).toMatchObject({ x: 0.5, y: 1, segment: 0 });
    expect(samplePath(p, 3)).toMatchObject({ x: 1, y: 2, segment: 1 });
    expect(samplePath(p, 5)).toBeNull();
    expect(samplePath(p, 3, 5)?.segment).toBe(1); // a stale hint is corrected
  });

  it('picks one id of several, and asks when it is not told which', () => {
    const text = 'time_s,target_id,x_m,y_m\n0,1,0,0\n0,2,5,5\n1,1,1,0\n1,2,6,5\n';
    expect(parsePathCsv(text, 't', { id: 2 }).map((q) => q.x)).toEqual([5, 6]);
    expect(() => parsePathCsv(text, 't')).toThrow(/2 ids/);
  });

  it('bad files give coded errors with line numbers', async () => {
    const fail = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return e;
      }
      return null;
    };
    expect(hasCode(fail(() => parsePathCsv('time_s,x,y\n0,0,0\n', 't')), 'E_INPUT_COLUMNS')).toBe(true);
    expect(hasCode(fail(() => parsePathCsv('time_s,x_m,y_m\n', 't')), 'E_INPUT_EMPTY')).toBe(true);
    const back = fail(() => parsePathCsv('time_s,x_m,y_m\n1,0,0\n0,1,1\n', 't'));
    expect((back as Error).message).toMatch(/line 3: time goes backwards/);
    expect((fail(() => parsePathCsv('time_s,x_m,y_m\n0,0,0\n1,x,1\n', 't')) as Error).message).toMatch(/line 3/);
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-path-'));
    await expect(readPathCsv(join(dir, 'none.csv'))).rejects.toThrow(/cannot read/);
    await writeFile(join(dir, 'p.csv'), 'time_s,x_m,y_m\n0,0,0\n1,1,1\n');
    expect(await readPathCsv(join(dir, 'p.csv'))).toHaveLength(2);
  });

  it('groups a tracks CSV by track id', () => {
    const m = parseTracksById('time_s,track_id,x_m,y_m,vx_mps\n0,3,0,0,0\n0,4,1,1,0\n1,3,0.1,0,0\nbad,3,0,0,0\n', 't');
    expect(m.get(3)).toHaveLength(2);
    expect(m.get(4)).toHaveLength(1);
    expect(() => parseTracksById('time_s,x_m\n', 't')).toThrow(/track_id/);
    // measurement columns are preferred when present; a coast (empty measurement) is left out
    const withMeas = 'time_s,track_id,x_m,y_m,meas_x_m,meas_y_m\n0,1,0,0,0.1,0.2\n1,1,1,1,,\n2,1,2,2,2.1,2.2\n';
    expect(parseTracksById(withMeas, 't').get(1)).toEqual([{ timeS: 0, x: 0.1, y: 0.2 }, { timeS: 2, x: 2.1, y: 2.2 }]);
    expect(parseTracksById(withMeas, 't', 'estimate').get(1)).toHaveLength(3);
  });
});
