/**
 * What crosses between readDetectionsCsvInWorker (detections-csv-thread.ts) and its worker
 * (detections-csv-worker.ts): packed detections, the skip report's plain parts, the messages.
 * Kept apart from the reader's zod schemas so that the worker does not load zod (a tenth of a
 * second of its start-up).
 */
import type { Detection } from '../types.ts';
import type { DetectionsCsvOptions, SkipReport } from './detections-csv.ts';

/** time_s, azimuth (rad), range (m), amplitude, line number: one packed detection. */
export const DETECTION_FIELDS = 5;

/** What the worker needs: the file and the reader's options. */
export interface DetectionsWorkerInput {
  path: string;
  options: DetectionsCsvOptions;
  /** Batches the worker may send before the consumer has taken the first of them. */
  window: number;
}

/** The report's plain parts, as they cross threads (a Map and a getter do not). */
export interface PlainSkipReport {
  rows: number;
  accepted: number;
  skipped: number;
  reasons: [string, number][];
  skippedLines: { line: number; reason: string }[];
  lastSkipped: { line: number; reason: string } | null;
  azimuthWrapped: number;
  firstWrappedLine: number | null;
}

/** Worker → reader. */
export type DetectionsWorkerMessage =
  /** One batch of packed detections and the report as it stands after it. */
  | { type: 'batch'; rows: Float64Array; report: PlainSkipReport }
  /** The file is read; the report is complete. */
  | { type: 'end'; report: PlainSkipReport }
  /** The read failed: an EchotrailError's code (null for another error) and message. */
  | { type: 'error'; code: string | null; message: string };

/** Reader → worker: the consumer took a batch, the worker may send one more. */
export interface MoreMessage {
  type: 'more';
}

/**
 * Checks what the worker was started with (hand-written, not zod: the worker bundle stays small
 * and starts fast, see worker-thread.ts).
 */
export function isDetectionsWorkerInput(v: unknown): v is DetectionsWorkerInput {
  const i = v as Partial<Record<keyof DetectionsWorkerInput, unknown>> | null;
  if (typeof i?.path !== 'string' || !Number.isInteger(i.window) || (i.window as number) < 1) return false;
  const o = i.options as Record<string, unknown> | null;
  if (typeof o !== 'object' || o === null) return false;
  const optionalNumber = (k: keyof DetectionsCsvOptions) => o[k] === undefined || typeof o[k] === 'number';
  return optionalNumber('maxRangeM') && optionalNumber('defaultAmplitude') && optionalNumber('spikeS');
}

/** True for the consumer's "send one more" message. */
export function isMoreMessage(m: unknown): m is MoreMessage {
  return (m as Partial<MoreMessage> | null)?.type === 'more';
}

/** The report's plain parts (for postMessage). */
export function plainReport(r: SkipReport): PlainSkipReport {
  return { rows: r.rows, accepted: r.accepted, skipped: r.skipped, reasons: [...r.reasons], skippedLines: r.skippedLines, lastSkipped: r.lastSkipped, azimuthWrapped: r.azimuthWrapped, firstWrappedLine: r.firstWrappedLine };
}

/** Packs detections for the crossing. */
export function packDetections(batch: readonly Detection[]): Float64Array<ArrayBuffer> {
  const a = new Float64Array(batch.length * DETECTION_FIELDS);
  let k = 0;
  for (const d of batch) {
    a[k++] = d.timeS;
    a[k++] = d.azimuthRad;
    a[k++] = d.rangeM;
    a[k++] = d.amplitude;
    a[k++] = d.line ?? NaN;
  }
  return a;
}

export function unpackDetections(a: Float64Array): Detection[] {
  const out: Detection[] = new Array(a.length / DETECTION_FIELDS);
  for (let i = 0, k = 0; k < a.length; i++, k += DETECTION_FIELDS) {
    const d: Detection = { timeS: a[k], azimuthRad: a[k + 1], rangeM: a[k + 2], amplitude: a[k + 3] };
    if (!Number.isNaN(a[k + 4])) d.line = a[k + 4];
    out[i] = d;
  }
  return out;
}
