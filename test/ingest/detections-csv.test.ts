import { mkdtemp, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PassThrough, Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { delimiterHint, formatSkipDetails, formatSkipReport, formatWrapNote, readDetectionsCsv, writeDetectionsCsv } from '../../bridge/ingest/detections-csv.ts';
import { hasCode } from '../../bridge/errors.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection } from '../../bridge/types.ts';

const fromText = (text: string) => Readable.from([text]);

async function readAll(text: string, options?: Parameters<typeof readDetectionsCsv>[1]) {
  const reader = readDetectionsCsv(fromText(text), options);
  const rows: Detection[] = [];
  for await (const d of reader) rows.push(d);
  return { rows, report: reader.report };
}

async function failure(text: string): Promise<unknown> {
  try {
    await readAll(text);
  } catch (err) {
    return err;
  }
  return null;
}

describe('readDetectionsCsv', () => {
  it('reads columns in any order, ignores others, converts degrees and wraps azimuth', async () => {
    const { rows, report } = await readAll('note,range_m,amplitude,time_s,azimuth_deg\nx,1.5,20,0.0,90\ny,2.25,15,0.5,-90\nz,3,1e1,1.0,720.5\n');
    expect(rows.map((r) => r.line)).toEqual([2, 3, 4]);
    expect(rows[0]).toMatchObject({ timeS: 0, rangeM: 1.5, amplitude: 20 });
    expect(rows[0].azimuthRad).toBeCloseTo(Math.PI / 2, 15);
    expect(rows[1].azimuthRad).toBeCloseTo((3 * Math.PI) / 2, 15);
    expect(rows[2].azimuthRad).toBeCloseTo((0.5 * Math.PI) / 180, 15);
    expect(report).toMatchObject({ rows: 3, accepted: 3, skipped: 0, firstSkipped: null });
    expect(formatSkipReport(report)).toBe('');
  });

  it('skips bad rows with their line numbers and keeps the good rows around them', async () => {
    const text = [
      'time_s,azimuth_deg,range_m,amplitude',
      '0.0,10,1.0,5', //   2 good
      '0.1,abc,1.0,5', //  3 non-numeric azimuth
      '0.2,10,NaN,5', //   4 NaN range
      '0.3,10,-1,5', //    5 negative range
      '0.4,10,5000,5', //  6 absurd range
      '0.5,10,1.0,0', //   7 amplitude 0
      '0.6,10,1.0,Infinity', // 8 non-finite amplitude
      '0.7,10,1.0,5', //   9 good
      '0.65,10,1.0,5', // 10 time going backwards
      ',10,1.0,5', //     11 empty time
      '0.8,10,1.0', //    12 missing cell
      '0.8,10,1.0,5', //  13 good (equal times are fine)
      '',
    ].join('\n');
    const { rows, report } = await readAll(text);
    expect(rows.map((r) => r.line)).toEqual([2, 9, 13]);
    expect(report.rows).toBe(12);
    expect(report.accepted).toBe(3);
    expect(report.skipped).toBe(9);
    expect(report.firstSkipped).toEqual({ line: 3, reason: 'azimuth_deg "abc" is not a number' });
    expect(Object.fromEntries(report.reasons)).toEqual({
      'bad azimuth_deg': 1, 'bad range_m': 1, 'range out of bounds': 2, 'amplitude not positive': 1, 'bad amplitude': 1, 'short row': 1, 'time going backwards': 1, 'bad time_s': 1,
    });
    expect(formatSkipReport(report)).toBe('9 rows skipped: first at line 3: azimuth_deg "abc" is not a number');
    // Every skipped row after the first, in line order, with its reason.
    const details = formatSkipDetails(report);
    expect(details).toHaveLength(8);
    expect(details.map((l) => Number(/^line (\d+): /.exec(l)?.[1]))).toEqual(report.skippedLines.slice(1).map((s) => s.line));
    expect(report.skippedLines.map((s) => s.line)).toEqual([...report.skippedLines.map((s) => s.line)].sort((a, b) => a - b));
    expect(formatSkipDetails(report, 3)).toEqual([...details.slice(0, 3), '… and 5 more']);
    const { report: r2 } = await readAll('time_s,azimuth_deg,range_m,amplitude\n0,1,2\n,1,2,3\n0,1,2,3\n');
    expect(r2.firstSkipped?.reason).toBe("the row has 3 fields where the header's columns need 4");
    expect(Object.fromEntries(r2.reasons)).toEqual({ 'short row': 1, 'bad time_s': 1 });
    expect(r2.skipped).toBe(2);
  });

  it('keeps a row whose azimuth lies outside [0, 360), wrapped into it, and says so', async () => {
    const { rows, report } = await readAll('time_s,azimuth_deg,range_m,amplitude\n0,10,2,5\n0.1,-30,2,5\n0.2,400,2,5\n0.3,359.5,2,5\n');
    expect(rows.map((r) => Math.round((r.azimuthRad * 180) / Math.PI * 10) / 10)).toEqual([10, 330, 40, 359.5]);
    expect(report.skipped).toBe(0);
    expect(report.azimuthWrapped).toBe(2);
    expect(report.firstWrappedLine).toBe(3);
    expect(formatWrapNote(report)).toBe('2 rows had azimuth_deg outside [0, 360) and were wrapped into it (first at line 3); the rows were kept');
    expect(formatWrapNote((await readAll('time_s,azimuth_deg,range_m,amplitude\n0,10,2,5\n')).report)).toBe('');
  });

  it('one far-future timestamp is skipped, not every row after it', async () => {
    const text = 'time_s,azimuth_deg,range_m,amplitude\n10,1,2,3\n10.5,1,2,3\n9000000,1,2,3\n11,1,2,3\n11.5,1,2,3\n11.2,1,2,3\n12,1,2,3\n';
    const { rows, report } = await readAll(text);
    expect(rows.map((r) => r.timeS)).toEqual([10, 10.5, 11, 11.5, 12]);
    expect(Object.fromEntries(report.reasons)).toEqual({ 'time jumps ahead': 1, 'time going backwards': 1 });
    expect(report.firstSkipped?.line).toBe(4);
    expect(report.accepted + report.skipped).toBe(report.rows);
  });

  it('a short run of far-ahead timestamps is skipped, and only it; a longer run in order is a real jump', async () => {
    const head = 'time_s,azimuth_deg,range_m,amplitude\n';
    const rows = (ts: number[]) => head + ts.map((t) => `${t},1,2,3`).join('\n') + '\n';
    // Two corrupted rows (10 s ahead) among 10.x: they go, the 10.x after them stay.
    const two = await readAll(rows([10.2, 10.3, 10.4, 20, 20.1, 10.5, 10.6, 10.7]));
    expect(two.rows.map((r) => r.timeS)).toEqual([10.2, 10.3, 10.4, 10.5, 10.6, 10.7]);
    expect(two.report.skippedLines).toEqual([
      { line: 5, reason: 'time_s 20 jumps ahead of the rows around it (next 10.5)' },
      { line: 6, reason: 'time_s 20.1 jumps ahead of the rows around it (next 10.5)' },
    ]);
    // Three in a row are still a run of bad rows.
    const three = await readAll(rows([10.2, 20, 20.1, 20.2, 10.5, 10.6]));
    expect(three.rows.map((r) => r.timeS)).toEqual([10.2, 10.5, 10.6]);
    // Four rows in order past the jump make it real: what falls back behind them is refused.
    const jump = await readAll(rows([10.2, 40, 40.1, 40.2, 40.3, 10.5, 40.4]));
    expect(jump.rows.map((r) => r.timeS)).toEqual([10.2, 40, 40.1, 40.2, 40.3, 40.4]);
    expect(jump.report.skippedLines).toEqual([{ line: 7, reason: "time_s 10.5 is earlier than the previous row's 40.3" }]);
  });

  it('counts physical lines through blank lines; a quoted line break costs only its continuation line', async () => {
    // One physical line is one record (quoting is off, so a stray quote cannot swallow good rows):
    // a line break inside a quoted cell leaves its continuation as a bad line of its own.
    const text = 'time_s,azimuth_deg,range_m,amplitude,note\n\n0,1,2,3,"two\nlines"\n1,1,x,3,plain\n\n2,1,2,3,\n';
    const { rows, report } = await readAll(text);
    expect(rows.map((r) => r.line)).toEqual([3, 7]); // 1 header, 2 blank, 3 good, 4 continuation, 5 bad, 6 blank, 7
    expect(report.skipped).toBe(2);
    expect(report.firstSkipped?.line).toBe(4);
  });

  it('batches() gives the same detections in arrays', async () => {
    const text = 'time_s,azimuth_deg,range_m,amplitude\n' + Array.from({ length: 500 }, (_, i) => `${i},1,2,3`).join('\n') + '\n';
    const reader = readDetectionsCsv(fromText(text));
    const all: Detection[] = [];
    for await (const b of reader.batches()) all.push(...b);
    expect(all.map((d) => d.timeS)).toEqual(Array.from({ length: 500 }, (_, i) => i));
    expect(reader.report.accepted).toBe(500);
  });

  it('empty input and header-only input are E_INPUT_EMPTY', async () => {
    expect(hasCode(await failure(''), 'E_INPUT_EMPTY')).toBe(true);
    expect(hasCode(await failure('\n\n'), 'E_INPUT_EMPTY')).toBe(true);
    expect(hasCode(await failure('time_s,azimuth_deg,range_m,amplitude\n'), 'E_INPUT_EMPTY')).toBe(true);
  });

  it('a missing column is E_INPUT_COLUMNS naming the column', async () => {
    const err = await failure('time_s,azimuth,range_m,amplitude\n0,1,2,3\n');
    expect(hasCode(err, 'E_INPUT_COLUMNS')).toBe(true);
    expect((err as Error).message).toMatch(/azimuth_deg/);
  });

  it('no usable row at all is E_INPUT_ROW with the first reason', async () => {
    const err = await failure('time_s,azimuth_deg,range_m,amplitude\n0,1,-2,3\n');
    expect(hasCode(err, 'E_INPUT_ROW')).toBe(true);
    expect((err as Error).message).toMatch(/line 2: range_m -2/);
  });

  it('a default amplitude stands in for a missing amplitude column when asked', async () => {
    const { rows } = await readAll('time_s,azimuth_deg,range_m\n0,1,2\n', { defaultAmplitude: 1 });
    expect(rows[0].amplitude).toBe(1);
  });

  it('streams: rows come out before the input has ended', async () => {
    // csv-parse holds the newest line until the next bytes arrive (it cannot yet tell whether the
    // line break is complete), and the reader holds three good rows for its time-order check, so
    // a row is released four lines later.
    const input = new PassThrough();
    const reader = readDetectionsCsv(input);
    const it = reader[Symbol.asyncIterator]();
    input.write('time_s,azimuth_deg,range_m,amplitude\n0,1,2,3\n1,1,2,3\n2,1,2,3\n3,1,2,3\n4,1,2,3\n');
    const first = await it.next();
    expect(first.value).toMatchObject({ timeS: 0, rangeM: 2 });
    expect(input.writableEnded).toBe(false);
    input.end('5,1,2,3\n');
    for (const t of [1, 2, 3, 4, 5]) expect((await it.next()).value).toMatchObject({ timeS: t });
    expect((await it.next()).done).toBe(true);
  });

  it('reads from a path, and reports a missing file as E_PATH', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-csv-'));
    const path = join(dir, 'd.csv');
    await writeFile(path, '\ufefftime_s,azimuth_deg,range_m,amplitude\r\n0,1,2,3\r\n');
    const rows: Detection[] = [];
    for await (const d of readDetectionsCsv(path)) rows.push(d);
    expect(rows).toHaveLength(1);
    let err: unknown;
    try {
      for await (const _ of readDetectionsCsv(join(dir, 'missing.csv'))) void _;
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_PATH')).toBe(true);
  });
});

describe('readDetectionsCsv early exit', () => {
  it('stops cleanly when the consumer breaks off; a stream handed in stays the caller\'s', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-csv-'));
    const path = join(dir, 'many.csv');
    await writeFile(path, 'time_s,azimuth_deg,range_m,amplitude\n' + Array.from({ length: 200_000 }, (_, i) => `${i},1,2,3`).join('\n') + '\n');
    const input = (await import('node:fs')).createReadStream(path);
    let n = 0;
    for await (const _ of readDetectionsCsv(input)) if (++n === 10) break;
    expect(n).toBe(10);
    // the caller's stream is unpiped, not destroyed: it can still be closed by its owner
    expect(input.destroyed).toBe(false);
    input.destroy();
    // and a path opened by the reader is released: reading it again works from the start
    const again = readDetectionsCsv(path);
    for await (const d of again) {
      expect(d.timeS).toBe(0);
      break;
    }
  });
});

describe('writeDetectionsCsv', () => {
  it('round-trips through the reader at the written resolution', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-csv-'));
    const path = join(dir, 'out.csv');
    const dets: Detection[] = Array.from({ length: 3000 }, (_, i) => ({ timeS: i * 0.01, azimuthRad: (i * 0.013) % (2 * Math.PI), rangeM: 0.5 + (i % 70) * 0.1, amplitude: 1 + i }));
    expect(await writeDetectionsCsv(dets, path)).toBe(3000);
    expect((await readFile(path, 'utf8')).split('\n')[0]).toBe('time_s,azimuth_deg,range_m,amplitude');
    const back: Detection[] = [];
    for await (const d of readDetectionsCsv(path)) back.push(d);
    expect(back).toHaveLength(3000);
    back.forEach((d, i) => {
      expect(Math.abs(d.timeS - dets[i].timeS)).toBeLessThan(1e-6);
      expect(Math.abs(d.rangeM - dets[i].rangeM)).toBeLessThan(1e-4);
      // 1e-4° written resolution
      expect(Math.abs(d.azimuthRad - dets[i].azimuthRad)).toBeLessThan((1e-4 * Math.PI) / 180);
      expect(d.amplitude).toBe(dets[i].amplitude);
    });
  });
});

describe('readDetectionsCsv: quotes', () => {
  it('a stray quote costs only its own line; quoted cells and header names still read', async () => {
    const text = ['"time_s","azimuth_deg",range_m,amplitude', '1.0,10,2.0,5', '1.1,"11,2.0,5', '"1.2","12",2.0,5', '1.3,13,2.0,5', '1.4,14,2.0,5', ''].join('\n');
    const r = readDetectionsCsv(Readable.from([text]));
    const got: number[] = [];
    for await (const d of r) got.push(d.timeS);
    expect(got).toEqual([1.0, 1.2, 1.3, 1.4]);
    expect(r.report.skipped).toBe(1);
    expect(r.report.firstSkipped?.line).toBe(3);
  });
});

describe('readDetectionsCsv: numbers', () => {
  it('reads every decimal form exactly as Number() does and refuses the rest', async () => {
    // The amplitude passes through unchanged, so it shows the parsed value itself: plain and
    // signed forms, leading and trailing points, exponents, more digits than a double holds,
    // the smallest and largest doubles.
    const good = ['7', '+.5', '5.', '0.1', '1e-30', '1E+2', '2.5e-5', '00012.5000', '12345678901234567890', '0.30000000000000004', '9007199254740993',
      '123456789012345e-22', '1e22', '1e23', '1.7976931348623157e308', '4.9e-324', '1e0001', '1e-00001', ' 5 ', '"7.25"'];
    const rng = createRng(3);
    for (let i = 0; i < 3000; i++) {
      const v = rng.uniform() * 10 ** Math.floor(rng.uniform() * 50 - 25);
      good.push([String(v), v.toFixed(Math.floor(rng.uniform() * 12)), v.toPrecision(1 + Math.floor(rng.uniform() * 20)), v.toExponential(Math.floor(rng.uniform() * 17))][i % 4]);
    }
    const usable = good.filter((c) => Number(c.trim().replace(/"/g, '')) > 0);
    const bad = ['1e', '.', '-', '+e1', '0x10', 'Infinity', '1e400', '1.2.3', '1e1.5', '--1', '1 2', ''];
    const lines = ['time_s,azimuth_deg,range_m,amplitude', ...[...usable, ...bad].map((c, i) => `${i},1,2,${c}`)];
    const { rows, report } = await readAll(lines.join('\n') + '\n');
    expect(rows.map((d) => d.amplitude)).toEqual(usable.map((c) => Number(c.trim().replace(/"/g, ''))));
    expect(report.skipped).toBe(bad.length);
    expect(Object.fromEntries(report.reasons)).toEqual({ 'bad amplitude': bad.length });
  });
});

describe('delimiterHint', () => {
  it('names semicolons or tabs when the header is one cell holding the column names', () => {
    expect(delimiterHint(['time_s;azimuth_deg;range_m;amplitude'])).toMatch(/separated by semicolons/);
    expect(delimiterHint(['time_s\tazimuth_deg\trange_m\tamplitude'])).toMatch(/separated by tabs/);
    expect(delimiterHint(['t', 'az', 'r'])).toBe('');
  });
});
