/**
 * Tracks CSV rows into a stream: formatted into bytes (TracksCsvEncoder) and handed over in
 * ~64 kB writes that wait for the stream to drain, so memory stays flat however many rows come.
 * `track` writes this way in its own thread, and its writer thread (tracks-csv-worker.ts) the same.
 */
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { EchotrailError } from '../errors.ts';
import type { TrackUpdate } from '../types.ts';
import { TracksCsvEncoder } from './tracks-csv.ts';

/** Output leaves in writes of about this many bytes: a write per row would cost more than the row. */
const CHUNK_BYTES = 65536;

/** Where the tracks CSV rows go. */
export interface RowSink {
  add(u: TrackUpdate): void;
  /** Resolves when the next rows may be added without piling up in memory. */
  room(): Promise<void>;
  /** Everything written and, for a file, the file closed. */
  end(): Promise<void>;
  /** A failed run: stop writing, release the file. */
  abandon(): void;
}

/**
 * The header, then rows as they are added. A write error rejects the next room() or end() with
 * E_PATH naming `shownOutput`. `toFile`: the sink ends and closes `out` (stdout is left open).
 */
export function tracksCsvSink(out: Writable, toFile: boolean, shownOutput: string): RowSink {
  const failed = new Promise<never>((_, reject) =>
    out.once('error', (e: Error) => reject(new EchotrailError('E_PATH', `cannot write ${shownOutput}: ${e.message}`, { cause: e }))),
  );
  failed.catch(() => undefined);
  const rows = new TracksCsvEncoder(CHUNK_BYTES);
  rows.header();
  return {
    add: (u) => rows.add(u),
    async room() {
      if (rows.length >= CHUNK_BYTES && !out.write(rows.take())) await Promise.race([once(out, 'drain'), failed]);
    },
    async end() {
      if (!out.write(rows.take())) await Promise.race([once(out, 'drain'), failed]);
      if (toFile) {
        out.end();
        await Promise.race([once(out, 'finish'), failed]);
      }
    },
    abandon: () => {
      if (toFile) out.destroy();
    },
  };
}
