/**
 * Opens the bridge's input from its options: the serial port, a recorded session or a detections
 * CSV (both replayed), through the modules of bridge/ingest/. Kept apart from the pipeline, which
 * only ever sees the `Source` contract.
 */
import { resolve } from 'node:path';
import { stat } from 'node:fs/promises';
import type { Source } from '../ingest/source.ts';
import { SerialSource } from '../ingest/serial-source.ts';
import { ReplaySource } from '../ingest/replay-source.ts';
import { findSession } from '../session/list.ts';
import { SESSION_SUFFIX } from '../session/format.ts';
import { EchotrailError } from '../errors.ts';
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

export function openSerialSource(serial: SerialSettings): Source {
  return new SerialSource(serial);
}

/** A session file or a detections CSV, replayed (the extension decides: `.csv` is a detections CSV). */
export async function openReplaySource(path: string, settings: ReplaySettings): Promise<Source> {
  const full = resolve(path);
  const info = await stat(full).catch(() => null);
  if (!info?.isFile()) throw new EchotrailError('E_PATH', `replay file '${path}' not found; give a session (${SESSION_SUFFIX}) or a detections CSV`);
  return new ReplaySource({ path: full, loop: settings.loop, speed: settings.speed, autoplay: settings.autoplay });
}

/** The source the options ask for, or null when the bridge starts idle (no serial, no replay). */
export async function openConfiguredSource(o: ResolvedBridgeOptions): Promise<Source | null> {
  if (o.createSource) return o.createSource(o);
  if (o.serial) return openSerialSource(o.serial);
  if (o.replay) return openReplaySource(o.replay, { loop: o.loop, speed: o.speed, autoplay: o.autoplay });
  if (o.playlist?.length) return openReplaySource(o.playlist[0], { loop: o.loop && o.playlist.length === 1, speed: o.speed, autoplay: o.autoplay });
  return null;
}

/** Resolves a session id from a client to its file in the sessions folder (unsafe ids are refused). */
export async function sessionPath(sessionDirs: string[], sessionId: string): Promise<string> {
  const path = await findSession(sessionDirs, sessionId);
  if (!path) throw new EchotrailError('E_PATH', `no session '${sessionId.slice(0, 80)}' in the sessions folder; pick one from the session list`);
  return path;
}
