/**
 * What crosses between TracksCsvWorkerWriter (tracks-csv-thread.ts) and its worker
 * (tracks-csv-worker.ts): track updates packed into numbers, and the messages. Kept apart from
 * the writer's zod schemas so that the worker does not load zod.
 */
import type { Measurement, TrackStatus, TrackUpdate } from '../types.ts';

/** What the CSV row needs of an update, packed (see packUpdate). */
export const UPDATE_FIELDS = 17;
/** Rows per piece sent to the worker: about 280 kB, a few ms of tracking. */
export const ROWS_PER_PIECE = 2048;
const STATUSES: readonly TrackStatus[] = ['tentative', 'confirmed', 'coasting'];

/** What the worker needs: where to write, and the name to use in an error. */
export interface TracksWorkerInput {
  path: string;
  shownPath: string;
}

/** Checks what the writer thread was started with (hand-written: see isTracksWorkerCommand). */
export function isTracksWorkerInput(v: unknown): v is TracksWorkerInput {
  const i = v as Partial<Record<keyof TracksWorkerInput, unknown>> | null;
  return typeof i?.path === 'string' && i.path.length > 0 && typeof i.shownPath === 'string';
}

/** Messages to the worker: a piece of `count` packed rows, or the end of the file. */
export type TracksWorkerCommand = { type: 'rows'; rows: Float64Array; count: number } | { type: 'end' };

/** Messages from the worker: a piece written, the file complete and closed, or why it could not be written. */
export type TracksWorkerMessage = { type: 'written' } | { type: 'done' } | { type: 'error'; message: string };

/** The worker's check of what it is sent (zod would add a tenth of a second to its start-up). */
export function isTracksWorkerCommand(m: unknown): m is TracksWorkerCommand {
  const c = m as Partial<{ type: string; rows: unknown; count: unknown }> | null;
  if (c?.type === 'end') return true;
  return c?.type === 'rows' && c.rows instanceof Float64Array && Number.isInteger(c.count) && (c.count as number) >= 0 && (c.count as number) * UPDATE_FIELDS <= c.rows.length;
}

/** Writes the fields of `u` the CSV row needs at a[k…k+UPDATE_FIELDS). */
export function packUpdate(a: Float64Array, k: number, u: TrackUpdate): void {
  a[k] = u.timeS;
  a[k + 1] = u.id;
  a[k + 2] = u.x;
  a[k + 3] = u.y;
  a[k + 4] = u.vx;
  a[k + 5] = u.vy;
  a[k + 6] = u.speed;
  a[k + 7] = u.headingRad;
  a[k + 8] = STATUSES.indexOf(u.status);
  a[k + 9] = u.quality;
  const m = u.measurement;
  // A coast has no measurement: NaN in its x says so.
  a[k + 10] = m ? m.x : NaN;
  a[k + 11] = m ? m.y : NaN;
  a[k + 12] = m ? m.rxx : NaN;
  a[k + 13] = m ? m.rxy : NaN;
  a[k + 14] = m ? m.ryy : NaN;
  a[k + 15] = u.nis ?? NaN;
  a[k + 16] = m ? m.timeS : NaN;
}

/**
 * The packed row at a[k…] into `into` (reused row after row: the encoder reads it and keeps
 * nothing). Fields the CSV row does not use are left as they were.
 */
export function unpackUpdate(a: Float64Array, k: number, into: TrackUpdate, measurement: Measurement): void {
  into.timeS = a[k];
  into.id = a[k + 1];
  into.x = a[k + 2];
  into.y = a[k + 3];
  into.vx = a[k + 4];
  into.vy = a[k + 5];
  into.speed = a[k + 6];
  into.headingRad = a[k + 7];
  into.status = STATUSES[a[k + 8]] ?? 'confirmed';
  into.quality = a[k + 9];
  if (Number.isNaN(a[k + 10])) into.measurement = undefined;
  else {
    measurement.x = a[k + 10];
    measurement.y = a[k + 11];
    measurement.rxx = a[k + 12];
    measurement.rxy = a[k + 13];
    measurement.ryy = a[k + 14];
    measurement.timeS = a[k + 16];
    into.measurement = measurement;
  }
  into.nis = Number.isNaN(a[k + 15]) ? undefined : a[k + 15];
}

