import { describe, expect, it } from 'vitest';
import { PassThrough, Writable } from 'node:stream';
import { tracksCsvSink } from '../../bridge/tracking/tracks-csv-sink.ts';
import { TRACKS_CSV_HEADER, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';
import { hasCode } from '../../bridge/errors.ts';
import type { TrackUpdate } from '../../bridge/types.ts';

const update = (i: number): TrackUpdate => ({
  timeS: i * 0.5, id: 1 + (i % 3), status: 'confirmed', x: -1 + i * 0.01, y: 2, vx: 0.02, vy: 0, speed: 0.02, headingRad: Math.PI / 2,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 3, misses: 0,
});

describe('tracksCsvSink', () => {
  it('writes the header and every row in the encoder\'s bytes, in pieces, and ends a file', async () => {
    const out = new PassThrough();
    const chunks: Buffer[] = [];
    out.on('data', (b: Buffer) => chunks.push(b));
    const sink = tracksCsvSink(out, true, 'tracks.csv');
    const rows = Array.from({ length: 3000 }, (_, i) => update(i));
    for (const [i, u] of rows.entries()) {
      sink.add(u);
      if (i % 500 === 499) await sink.room();
    }
    await sink.end();
    expect(out.writableEnded).toBe(true);
    expect(chunks.length).toBeGreaterThan(2);
    expect(Buffer.concat(chunks).toString('utf8')).toBe([TRACKS_CSV_HEADER, ...rows.map(trackCsvLine)].join('\n') + '\n');
  });

  it('leaves a stream that is not its file (stdout) open', async () => {
    const out = new PassThrough();
    out.resume();
    const sink = tracksCsvSink(out, false, '-');
    sink.add(update(1));
    await sink.end();
    expect(out.writableEnded).toBe(false);
  });

  it('a write error reaches the caller as E_PATH naming the output as the user gave it', async () => {
    const out = new Writable({ write: (_c, _e, done) => done(new Error('disk full')) });
    const sink = tracksCsvSink(out, true, 'results/tracks.csv');
    sink.add(update(1));
    const err = await sink.end().then(() => null, (e: unknown) => e);
    expect(hasCode(err, 'E_PATH')).toBe(true);
    expect((err as Error).message).toBe('cannot write results/tracks.csv: disk full');
  });
});
