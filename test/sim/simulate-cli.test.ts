// Tests bridge/cli/simulate.ts (kept beside the simulator's tests).
import { mkdtemp, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { run } from '../../bridge/cli/simulate.ts';
import { readDetectionsCsv } from '../../bridge/ingest/detections-csv.ts';

describe('echotrail simulate', () => {
  it('writes detections the reader accepts, plus truth and commanded files', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    const out = join(dir, 'd.csv');
    const code = await run(['--scenario', 'crossing-pair', '--seed', '4', '--duration', '12', '--out', out, '--truth', join(dir, 't.csv'), '--commanded', join(dir, 'c.csv')]);
    expect(code).toBe(0);
    const reader = readDetectionsCsv(Readable.from([await readFile(out, 'utf8')]));
    let n = 0;
    for await (const d of reader) if (d.timeS <= 12) n++;
    expect(n).toBeGreaterThan(100);
    expect(reader.report.skipped).toBe(0);
    const truth = (await readFile(join(dir, 't.csv'), 'utf8')).trim().split('\n');
    expect(truth).toHaveLength(1 + 2 * 121); // two targets at 10 Hz over 0…12 s
    expect((await readFile(join(dir, 'c.csv'), 'utf8')).split('\n')[0]).toBe('time_s,target_id,x_m,y_m');
  });

  it('writes one commanded file per target when the path holds {id}', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    expect(await run(['--scenario', 'crossing-pair', '--duration', '5', '--out', join(dir, 'd.csv'), '--commanded', join(dir, 'cmd-{id}.csv')])).toBe(0);
    for (const id of [1, 2]) {
      const lines = (await readFile(join(dir, `cmd-${id}.csv`), 'utf8')).trim().split('\n');
      expect(lines).toHaveLength(1 + 51);
      expect(lines.slice(1).every((l) => l.split(',')[1] === String(id))).toBe(true);
    }
  });

  it('takes a scenario file and overrides, and fails cleanly on a bad one', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    const scn = join(dir, 's.json');
    await writeFile(scn, JSON.stringify({ durationS: 3, falseAlarmRateHz: 0, pd: 1, targets: [{ trajectory: { kind: 'static', at: { x: 0, y: 2 } } }] }));
    const out = join(dir, 'd.csv');
    expect(await run(['--scenario', scn, '--out', out, '--period', '0.5'])).toBe(0);
    expect((await readFile(out, 'utf8')).trim().split('\n')).toHaveLength(1 + 6);
    await writeFile(scn, JSON.stringify({ durationS: -3 }));
    expect(await run(['--scenario', scn, '--out', out])).toBe(1);
    expect(await run(['--no-such-option'])).toBe(2);
  });
});
