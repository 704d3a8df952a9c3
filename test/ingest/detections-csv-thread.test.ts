import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { DETECTIONS_CSV_HEADER, detectionCsvLine, readDetectionsCsv, type DetectionsCsvReader } from '../../bridge/ingest/detections-csv.ts';
import { readDetectionsCsvInWorker } from '../../bridge/ingest/detections-csv-thread.ts';
import { packDetections, unpackDetections } from '../../bridge/ingest/detections-packing.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import { EchotrailError } from '../../bridge/errors.ts';
import type { Detection } from '../../bridge/types.ts';

let dir = '';
let big = '';
let lines: string[] = [];

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'echotrail-detections-thread-'));
  const rng = createRng(9);
  // 60k rows (several batches) with bad rows of every kind scattered through them.
  const rows = Array.from({ length: 60000 }, (_, i): Detection => ({ timeS: i * 0.001, azimuthRad: rng.uniform() * 6.28, rangeM: 0.5 + rng.uniform() * 5, amplitude: 1 + rng.uniform() * 30 }));
  lines = [DETECTIONS_CSV_HEADER, ...rows.map(detectionCsvLine)];
  lines[11] = '0.0105,abc,1.0,5';
  lines[30001] = '1e9,1,1,1'; // a time far ahead of the rows around it
  lines[45000] = '"broken,1,2';
  lines[59990] = '12,1,2,3'; // time going backwards
  lines[50000] = `${(49999 * 0.001).toFixed(4)},-30,2,5`; // azimuth outside [0, 360): kept, wrapped, counted
  big = join(dir, 'big.csv');
  writeFileSync(big, lines.join('\n') + '\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function readAll(reader: DetectionsCsvReader): Promise<{ rows: Detection[]; batches: number }> {
  const rows: Detection[] = [];
  let batches = 0;
  for await (const b of reader.batches()) {
    batches++;
    rows.push(...b);
  }
  return { rows, batches };
}

async function failure(reader: DetectionsCsvReader): Promise<unknown> {
  return readAll(reader).then(() => null, (e: unknown) => e);
}

describe('packed detections', () => {
  it('unpack to the detections packed, line numbers included and absent ones left out', () => {
    const d: Detection[] = [{ timeS: 1.25, azimuthRad: 0.5, rangeM: 3, amplitude: 7, line: 12 }, { timeS: 2, azimuthRad: 6.2, rangeM: 0.1, amplitude: 1e-3 }];
    expect(unpackDetections(packDetections(d))).toEqual(d);
  });
});

describe('readDetectionsCsvInWorker', () => {
  it('gives the detections, line numbers and skip report of the in-thread reader, in several batches', async () => {
    const here = readDetectionsCsv(big);
    const there = readDetectionsCsvInWorker(big, {}, 2);
    const a = await readAll(here);
    const b = await readAll(there);
    expect(b.batches).toBeGreaterThan(3);
    expect(b.rows.length).toBe(60000 - 4);
    expect(b.rows).toEqual(a.rows);
    expect(there.report.skipped).toBe(4);
    expect(there.report.firstSkipped).toEqual(here.report.firstSkipped);
    expect(there.report.skippedLines).toEqual(here.report.skippedLines);
    expect([...there.report.reasons]).toEqual([...here.report.reasons]);
    expect(there.report.skippedLines.map((s) => s.line)).toEqual([12, 30002, 45001, 59991]);
    expect(there.report.lastSkipped).toEqual(here.report.lastSkipped);
    expect(there.report.lastSkipped?.line).toBe(59991);
    expect(there.report.azimuthWrapped).toBe(1);
    expect(there.report.firstWrappedLine).toBe(50001);
    expect(here.report.firstWrappedLine).toBe(50001);
  });

  it('passes the reader options on', async () => {
    const there = readDetectionsCsvInWorker(big, { maxRangeM: 3 });
    const { rows } = await readAll(there);
    expect(rows.every((d) => d.rangeM <= 3)).toBe(true);
    expect(there.report.reasons.get('range out of bounds')).toBeGreaterThan(10000);
  });

  it('throws the errors of the in-thread reader, with their codes', async () => {
    const empty = join(dir, 'empty.csv');
    writeFileSync(empty, '');
    const columns = join(dir, 'columns.csv');
    writeFileSync(columns, 'time_s,range_m\n0,1\n');
    for (const path of [empty, columns, join(dir, 'missing.csv')]) {
      const here = await failure(readDetectionsCsv(path));
      const there = await failure(readDetectionsCsvInWorker(path));
      expect(there).toBeInstanceOf(EchotrailError);
      expect((there as EchotrailError).code).toBe((here as EchotrailError).code);
      expect((there as Error).message).toBe((here as Error).message);
    }
  });

  it('can be left after its first batch, and read again', async () => {
    let first: Detection[] = [];
    for await (const b of readDetectionsCsvInWorker(big, {}, 1).batches()) {
      first = b;
      break;
    }
    expect(first.length).toBeGreaterThan(0);
    expect(first.length).toBeLessThan(60000);
    const again = await readAll(readDetectionsCsvInWorker(big));
    expect(again.rows.slice(0, first.length)).toEqual(first);
  });
});
