/**
 * The detections CSV read in a worker thread (detections-csv-worker.ts): the same reader, the
 * same detections, the same skip report and errors as readDetectionsCsv, while the thread that
 * consumes them does other work. On a 2-core machine `track` reads its input this way so that
 * parsing (about a fifth of its time in one thread) overlaps the tracking.
 *
 * Detections cross in packed batches (DETECTION_FIELDS numbers each, one transferred buffer per
 * batch, no copy); the worker runs at most `window` batches ahead of the consumer, so memory stays
 * bounded when the consumer is the slower side. Every message from the worker is checked
 * (zod) before use.
 */
import { z } from 'zod';
import { EchotrailError, isErrorCode } from '../errors.ts';
import { startWorker, workerFailure } from '../worker-thread.ts';
import { newSkipReport, type DetectionsCsvOptions, type DetectionsCsvReader, type SkipReport } from './detections-csv.ts';
import { DETECTION_FIELDS, unpackDetections, type DetectionsWorkerInput, type DetectionsWorkerMessage, type MoreMessage, type PlainSkipReport } from './detections-packing.ts';
import type { Detection } from '../types.ts';

/** The report's plain parts, as they cross threads (a Map and a getter do not). */
const reportSchema = z.object({
  rows: z.number().int().nonnegative(),
  accepted: z.number().int().nonnegative(),
  skipped: z.number().int().nonnegative(),
  reasons: z.array(z.tuple([z.string(), z.number().int().nonnegative()])),
  skippedLines: z.array(z.object({ line: z.number().int().nonnegative(), reason: z.string() })),
  lastSkipped: z.object({ line: z.number().int().nonnegative(), reason: z.string() }).nullable(),
  azimuthWrapped: z.number().int().nonnegative(),
  firstWrappedLine: z.number().int().positive().nullable(),
});

const fromWorker: z.ZodType<DetectionsWorkerMessage> = z.discriminatedUnion('type', [
  /** One batch of packed detections and the report as it stands after it. */
  z.object({ type: z.literal('batch'), rows: z.instanceof(Float64Array).refine((a) => a.length % DETECTION_FIELDS === 0, 'not whole detections'), report: reportSchema }),
  /** The file is read; the report is complete. */
  z.object({ type: z.literal('end'), report: reportSchema }),
  /** The read failed: an EchotrailError's code (null for another error) and message. */
  z.object({ type: z.literal('error'), code: z.string().nullable(), message: z.string() }),
]);

function applyReport(to: SkipReport, from: PlainSkipReport): void {
  to.rows = from.rows;
  to.accepted = from.accepted;
  to.skipped = from.skipped;
  to.reasons = new Map(from.reasons);
  to.skippedLines.splice(0, to.skippedLines.length, ...from.skippedLines);
  to.lastSkipped = from.lastSkipped;
  to.azimuthWrapped = from.azimuthWrapped;
  to.firstWrappedLine = from.firstWrappedLine;
}

/** The worker's error as the in-thread reader would have thrown it. */
function errorFrom(m: { code: string | null; message: string }): Error {
  return isErrorCode(m.code) ? new EchotrailError(m.code, m.message) : new Error(m.message);
}

/**
 * Reads the detections CSV at `path` (a file, not stdin) in a worker thread. Same contract as
 * readDetectionsCsv: the report is updated batch by batch and complete once the iteration ends;
 * stopping the iteration early stops the worker.
 */
export function readDetectionsCsvInWorker(path: string, options: DetectionsCsvOptions = {}, window = 8): DetectionsCsvReader {
  const report = newSkipReport();
  async function* batches(): AsyncGenerator<Detection[]> {
    const input: DetectionsWorkerInput = { path, options, window };
    const worker = await startWorker(new URL('./detections-csv-worker.ts', import.meta.url), input);
    const inbox: unknown[] = [];
    let wake: (() => void) | null = null;
    const arrive = (m: unknown) => {
      inbox.push(m);
      wake?.();
    };
    worker.on('message', arrive);
    worker.on('error', (err) => arrive({ type: 'crash', cause: err }));
    worker.on('exit', (code) => arrive({ type: 'crash', cause: code }));
    try {
      for (;;) {
        while (inbox.length === 0) await new Promise<void>((r) => (wake = r));
        wake = null;
        const raw = inbox.shift() as { type?: string; cause?: unknown };
        if (raw.type === 'crash') throw workerFailure('the detections reader thread', raw.cause);
        const m = fromWorker.parse(raw);
        if (m.type === 'error') throw errorFrom(m);
        applyReport(report, m.report);
        if (m.type === 'end') return;
        worker.postMessage({ type: 'more' } satisfies MoreMessage);
        yield unpackDetections(m.rows);
      }
    } finally {
      // Done, failed or stopped early: the worker has nothing more to say either way.
      worker.removeAllListeners();
      await worker.terminate();
    }
  }
  async function* rows(): AsyncGenerator<Detection> {
    for await (const batch of batches()) yield* batch;
  }
  return { report, batches, [Symbol.asyncIterator]: rows };
}
