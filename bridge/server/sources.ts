/**
 * Opens the bridge's input from its options: the serial port, a recorded session or a detections
 * CSV (both replayed), through the modules of bridge/ingest/. Kept apart from the pipeline, which
 * only ever sees the `Source` contract.
 */
import { basename, join, resolve } from 'node:path';
import { stat } from 'node:fs/promises';
import type { Source } from '../ingest/source.ts';
import { EchotrailError } from '../errors.ts';
import { importOptional } from './deps.ts';
import type { ResolvedBridgeOptions, SerialSettings } from './options.ts';

/** How a replay is to run. */
export interface ReplaySettings {
  /** Start again at the end. */
  loop: boolean;
  /** Speed factor 0.1–50. */
  speed: number;
  /** Start playing at once. */
  autoplay: boolean;
}

type Ctor<A extends unknown[]> = new (...args: A) => Source;

async function ingestExport<T>(file: string, names: string[]): Promise<T> {
  const mod = await importOptional(`../ingest/${file}`);
  for (const n of names) if (mod && typeof mod[n] === 'function') return mod[n] as T;
  throw new EchotrailError('E_OPTION', `bridge/ingest/${file} is missing or exports none of ${names.join(', ')}`);
}

export async function openSerialSource(serial: SerialSettings): Promise<Source> {
  const SerialSource = await ingestExport<Ctor<[SerialSettings]>>('serial-source.ts', ['SerialSource']);
  return new SerialSource(serial);
}

/** A session file or a detections CSV, replayed. */
export async function openReplaySource(path: string, settings: ReplaySettings): Promise<Source> {
  const full = resolve(path);
  const info = await stat(full).catch(() => null);
  if (!info?.isFile()) throw new EchotrailError('E_PATH', `replay file '${path}' not found; give a session (.session.jsonl) or a detections CSV`);
  const open = await ingestExport<(p: string, o: ReplaySettings) => Source | Promise<Source>>('replay-source.ts', ['openReplay', 'openReplaySource']);
  return open(full, settings);
}

/** The source the options ask for, or null when the bridge starts idle (no serial, no replay). */
export async function openConfiguredSource(o: ResolvedBridgeOptions): Promise<Source | null> {
  if (o.createSource) return o.createSource(o);
  if (o.serial) return openSerialSource(o.serial);
  if (o.replay) return openReplaySource(o.replay, { loop: o.loop, speed: o.speed, autoplay: o.autoplay });
  return null;
}

/**
 * Resolves a session id from a client to a file inside the sessions folder. Ids are file names:
 * anything with a path separator or a leading dot is refused, so a client cannot name other files.
 */
export async function sessionPath(sessionsDir: string, sessionId: string): Promise<string> {
  if (!sessionId || sessionId !== basename(sessionId) || sessionId.startsWith('.') || sessionId.includes('\\')) {
    throw new EchotrailError('E_PATH', `'${sessionId.slice(0, 80)}' is not a session id (use an id from the session list)`);
  }
  const full = join(sessionsDir, sessionId);
  const info = await stat(full).catch(() => null);
  if (!info?.isFile()) throw new EchotrailError('E_PATH', `no session '${sessionId.slice(0, 80)}' in the sessions folder`);
  return full;
}
