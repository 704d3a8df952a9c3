import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { TracksCsvWorkerWriter } from '../../bridge/tracking/tracks-csv-thread.ts';
import { isTracksWorkerCommand, packUpdate, ROWS_PER_PIECE, unpackUpdate, UPDATE_FIELDS } from '../../bridge/tracking/tracks-packing.ts';
import { TRACKS_CSV_HEADER, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import { hasCode } from '../../bridge/errors.ts';
import type { Measurement, TrackStatus, TrackUpdate } from '../../bridge/types.ts';

let dir = '';
beforeAll(() => (dir = mkdtempSync(join(tmpdir(), 'echotrail-tracks-thread-'))));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Updates of every kind the rows show: all statuses, coasts, no NIS, negative values. */
function updates(count: number, seed: number): TrackUpdate[] {
  const rng = createRng(seed);
  const statuses: TrackStatus[] = ['tentative', 'confirmed', 'coasting'];
  return Array.from({ length: count }, (_, i) => {
    const v = () => (rng.uniform() - 0.5) * 40;
    const u: TrackUpdate = {
      timeS: i * 0.013, id: 1 + (i % 97), status: statuses[i % 3], x: v(), y: v(), vx: v() / 10, vy: v() / 10, speed: Math.abs(v()), headingRad: rng.uniform() * 6.28,
      pxx: 0.01, pxy: 0, pyy: 0.01, quality: rng.uniform(), moving: true, hits: 3, misses: 0,
    };
    if (i % 4) u.measurement = { timeS: u.timeS, x: v(), y: v(), rxx: rng.uniform() / 100, rxy: (rng.uniform() - 0.5) / 1000, ryy: rng.uniform() / 100 };
    if (i % 5) u.nis = rng.uniform() * 9;
    return u;
  });
}

describe('packed track updates', () => {
  it('unpack to rows identical to the originals', () => {
    const rows = updates(500, 3);
    const a = new Float64Array(rows.length * UPDATE_FIELDS);
    rows.forEach((u, i) => packUpdate(a, i * UPDATE_FIELDS, u));
    const into = {} as TrackUpdate;
    const m = {} as Measurement;
    rows.forEach((u, i) => {
      unpackUpdate(a, i * UPDATE_FIELDS, into, m);
      expect(trackCsvLine(into)).toBe(trackCsvLine(u));
    });
  });

  it('the worker refuses a command that is not whole rows', () => {
    expect(isTracksWorkerCommand({ type: 'end' })).toBe(true);
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS * 2), count: 2 })).toBe(true);
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS), count: 2 })).toBe(false);
    expect(isTracksWorkerCommand({ type: 'rows', rows: [1, 2], count: 0 })).toBe(false);
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS), count: 0.5 })).toBe(false);
    expect(isTracksWorkerCommand(null)).toBe(false);
  });
});

describe('TracksCsvWorkerWriter', () => {
  it('writes the bytes of the in-thread encoder, over several pieces, with a small window', async () => {
    const rows = updates(3 * ROWS_PER_PIECE + 17, 5);
    const path = join(dir, 'tracks.csv');
    const w = await TracksCsvWorkerWriter.open(path, 'tracks.csv', 1);
    for (const u of rows) {
      w.add(u);
      await w.room();
    }
    await w.end();
    expect(readFileSync(path, 'utf8')).toBe([TRACKS_CSV_HEADER, ...rows.map(trackCsvLine)].join('\n') + '\n');
  });

  it('writes a header alone when no row came', async () => {
    const path = join(dir, 'none.csv');
    const w = await TracksCsvWorkerWriter.open(path, 'none.csv');
    await w.end();
    expect(readFileSync(path, 'utf8')).toBe(TRACKS_CSV_HEADER + '\n');
  });

  it('fails with E_PATH, naming the shown path, when the file cannot be written', async () => {
    const w = await TracksCsvWorkerWriter.open(join(dir, 'no-such-folder', 'x.csv'), 'results/x.csv');
    for (const u of updates(10, 6)) w.add(u);
    const err = await w.end().then(() => null, (e: unknown) => e);
    expect(hasCode(err, 'E_PATH')).toBe(true);
    expect((err as Error).message).toMatch(/^cannot write results\/x\.csv: .*ENOENT/);
  });
});
