/** Options of ReplaySource (replay-source.ts), with their defaults in one place. */
import { EchotrailError } from '../errors.ts';
import { systemClock, type ReplayClock } from './replay-clock.ts';
import type { OpenSessionOptions } from '../session/reader.ts';

export interface ReplaySourceOptions {
  /** Session file (`.session.jsonl`) or detections CSV (`.csv`). */
  path: string;
  /** File kind; 'auto' decides by the extension (`.csv` is a detections CSV). */
  format: 'auto' | 'session' | 'csv';
  /** Speed factor, 0.1–50. */
  speed: number;
  /** Start again from 0 at the end. */
  loop: boolean;
  /** Start playing on start(); otherwise start paused at 0. */
  autoplay: boolean;
  /** Default step() length, run seconds; null: one antenna revolution as recorded, else 0.5 s. */
  stepS: number | null;
  /** Longest wait between two releases, wall ms (keeps the position display moving in gaps). */
  maxTickMs: number;
  /** Shortest wait between two releases, wall ms: records due meanwhile go out together. */
  minTickMs: number;
  /** Most records released per tick before yielding to the event loop. */
  maxPerTick: number;
  /** Clock (tests inject a ManualClock). */
  clock: ReplayClock;
  /** Seek-index and snapshot windows of the session reader. */
  session: Partial<OpenSessionOptions>;
}

export function resolveReplaySourceOptions(o: Partial<ReplaySourceOptions> & { path: string }): ReplaySourceOptions {
  const r: ReplaySourceOptions = {
    path: o.path,
    format: o.format ?? 'auto',
    speed: o.speed ?? 1,
    loop: o.loop ?? false,
    autoplay: o.autoplay ?? true,
    stepS: o.stepS ?? null,
    maxTickMs: o.maxTickMs ?? 100,
    minTickMs: o.minTickMs ?? 4,
    maxPerTick: o.maxPerTick ?? 20_000,
    clock: o.clock ?? systemClock,
    session: o.session ?? {},
  };
  if (!r.path) throw new EchotrailError('E_OPTION', 'replay needs a file path');
  if (!(r.speed >= 0.1 && r.speed <= 50)) throw new EchotrailError('E_OPTION', `replay speed ${r.speed} outside 0.1–50`);
  if (r.stepS !== null && !(r.stepS > 0)) throw new EchotrailError('E_OPTION', 'replay step must be a positive number of seconds');
  return r;
}
