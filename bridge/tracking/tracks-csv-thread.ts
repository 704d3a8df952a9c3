/**
 * The tracks CSV written in a worker thread (tracks-csv-worker.ts): the same bytes as the
 * in-thread TracksCsvEncoder, formatted and written while the tracking thread goes on. On a
 * 2-core machine `track` writes its output this way (formatting and writing cost about a sixth of
 * its time in one thread).
 *
 * Updates cross packed, UPDATE_FIELDS numbers each, in pieces of ROWS_PER_PIECE rows (one
 * transferred buffer each, no copy). At most `window` pieces are in flight: room() waits when the
 * worker falls behind, so memory stays bounded. Every message from the worker is checked (zod).
 */
import type { Worker } from 'node:worker_threads';
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';
import { startWorker, workerFailure } from '../worker-thread.ts';
import { packUpdate, ROWS_PER_PIECE, UPDATE_FIELDS, type TracksWorkerCommand, type TracksWorkerInput, type TracksWorkerMessage } from './tracks-packing.ts';
import type { TrackUpdate } from '../types.ts';
import type { RowSink } from './tracks-csv-sink.ts';

const fromWorker: z.ZodType<TracksWorkerMessage> = z.discriminatedUnion('type', [
  /** One piece formatted and handed to the file. */
  z.object({ type: z.literal('written') }),
  /** Everything is in the file, which is closed. */
  z.object({ type: z.literal('done') }),
  /** The file could not be written (the message names it). */
  z.object({ type: z.literal('error'), message: z.string() }),
]);

/** Writes a tracks CSV file from a worker thread; the caller adds rows, waits for room, ends. */
export class TracksCsvWorkerWriter implements RowSink {
  private piece = new Float64Array(ROWS_PER_PIECE * UPDATE_FIELDS);
  private count = 0;
  private inFlight = 0;
  private failure: Error | null = null;
  private done = false;
  private wake: (() => void) | null = null;

  /**
   * Starts the writer thread on `path` (created or replaced).
   * @param shownPath the name errors give the file (the final name when `path` is a temporary file)
   * @param window pieces that may be in flight before room() waits (32: about 9 MB, which also
   *   covers the worker's start-up without holding the tracking up)
   */
  static async open(path: string, shownPath: string, window = 32): Promise<TracksCsvWorkerWriter> {
    return new TracksCsvWorkerWriter(await startWorker(new URL('./tracks-csv-worker.ts', import.meta.url), { path, shownPath } satisfies TracksWorkerInput), window);
  }

  private constructor(private readonly worker: Worker, private readonly window: number) {
    worker.on('message', (raw: unknown) => {
      const m = fromWorker.safeParse(raw);
      if (!m.success) this.fail(new Error(`the tracks writer thread sent an unreadable message: ${m.error.message}`));
      else if (m.data.type === 'written') this.inFlight--;
      else if (m.data.type === 'done') this.done = true;
      else this.fail(new EchotrailError('E_PATH', m.data.message));
      this.wake?.();
    });
    worker.on('error', (err) => this.fail(workerFailure('the tracks writer thread', err)));
    worker.on('exit', (code) => {
      if (!this.done) this.fail(workerFailure('the tracks writer thread', code));
    });
  }

  /** Queues one row. */
  add(u: TrackUpdate): void {
    packUpdate(this.piece, this.count * UPDATE_FIELDS, u);
    if (++this.count === ROWS_PER_PIECE) this.send();
  }

  /** Resolves once fewer than `window` pieces are in flight; throws the worker's failure, if any. */
  async room(): Promise<void> {
    while (!this.failure && this.inFlight >= this.window) await this.wait();
    if (this.failure) throw this.failure;
  }

  /** Sends the last rows, waits until the file is complete and closed, stops the worker. */
  async end(): Promise<void> {
    if (this.count) this.send();
    if (!this.failure) this.worker.postMessage({ type: 'end' } satisfies TracksWorkerCommand);
    while (!this.failure && !this.done) await this.wait();
    await this.stop();
    if (this.failure) throw this.failure;
  }

  /** A failed run: stops the worker without finishing the file (the caller discards it). */
  abandon(): void {
    void this.stop();
  }

  private async stop(): Promise<void> {
    this.done = true;
    this.worker.removeAllListeners();
    await this.worker.terminate();
  }

  private send(): void {
    const rows = this.piece;
    this.worker.postMessage({ type: 'rows', rows, count: this.count } satisfies TracksWorkerCommand, [rows.buffer as ArrayBuffer]);
    this.inFlight++;
    this.piece = new Float64Array(ROWS_PER_PIECE * UPDATE_FIELDS);
    this.count = 0;
  }

  private wait(): Promise<void> {
    return new Promise<void>((r) => (this.wake = r));
  }

  private fail(err: Error): void {
    this.failure ??= err;
    this.wake?.();
  }
}
