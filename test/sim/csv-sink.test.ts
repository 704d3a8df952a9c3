import { mkdtemp, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { CsvSink, TRUTH_CSV_HEADER, commandedCsvLine, truthCsvLine } from '../../bridge/sim/csv-sink.ts';

describe('CsvSink and truth rows', () => {
  it('writes the header and every line, across buffer flushes', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-sink-'));
    const path = join(dir, 't.csv');
    const sink = new CsvSink(path, TRUTH_CSV_HEADER);
    for (let i = 0; i < 5000; i++) await sink.push(truthCsvLine({ timeS: i / 10, targetId: 1, x: i, y: -i, vx: 0.5, vy: 0 }));
    await sink.close();
    const lines = (await readFile(path, 'utf8')).trim().split('\n');
    expect(lines[0]).toBe('time_s,target_id,x_m,y_m,vx_mps,vy_mps');
    expect(lines).toHaveLength(5001);
    expect(lines[4].split(',').map(Number)).toEqual([0.3, 1, 3, -3, 0.5, 0]);
    expect(sink.lines).toBe(5000);
  });

  it('commanded rows carry the target id', () => {
    expect(commandedCsvLine(2, { timeS: 1.5, x: 0.25, y: 3 })).toBe('1.500000,2,0.2500,3.0000');
  });
});
