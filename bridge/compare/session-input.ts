/**
 * Comparison inputs from a recorded session (bridge/session/reader.ts): the track updates the
 * tracker produced live, and the commanded path — the session's own commanded-path record, or the
 * positioner records. Only the reader's public API is used: openSession(), records(), close().
 */
import { EchotrailError } from '../errors.ts';
import { openSession } from '../session/reader.ts';
import type { PositionerSample } from '../types.ts';
import { positionerToPath } from './positioner.ts';
import { makeTimedPath, type TimedPath } from './timed-path.ts';
import { rowFromUpdate, type TrackRow } from './track-rows.ts';
import type { UnitCheckOptions } from './units.ts';

/** Which record gives the commanded path. */
export type SessionPathSource = 'auto' | 'commanded' | 'positioner';

/** What a session contributes. */
export interface SessionInput {
  rows: TrackRow[];
  commanded: TimedPath;
  /** Where the path came from, for the summary. */
  pathSource: 'commanded' | 'positioner';
  warnings: string[];
}

/** Read a session for comparison; `auto` prefers a commanded-path record, else positioner records. */
export async function readSessionInput(file: string, source: SessionPathSource = 'auto', units: Partial<UnitCheckOptions> = {}): Promise<SessionInput> {
  const reader = await openSession(file);
  const rows: TrackRow[] = [];
  const positioner: PositionerSample[] = [];
  const paths: { timeS: number; x: number; y: number }[][] = [];
  const warnings: string[] = [];
  try {
    if (reader.badLineCount > 0) warnings.push(`${reader.badLineCount} bad line(s) in the session were skipped (first at line ${reader.badLines[0]?.line}: ${reader.badLines[0]?.reason})`);
    for (const r of reader.records(-Infinity)) {
      const rec = r.record;
      if (rec.kind === 'track') rows.push(rowFromUpdate(rec.update));
      else if (rec.kind === 'positioner') positioner.push(rec.sample);
      else if (rec.kind === 'commanded') paths.push(rec.path);
    }
  } finally {
    reader.close();
  }
  rows.sort((a, b) => a.timeS - b.timeS);
  const what = `session ${file}`;
  const useCommanded = source === 'commanded' || (source === 'auto' && paths.length > 0);
  if (useCommanded) {
    if (paths.length === 0) throw new EchotrailError('E_PATH', `${what} holds no commanded-path record; use --session-path positioner or give --commanded`);
    if (paths.length > 1) warnings.push(`${what} holds ${paths.length} commanded-path records; the last one is used`);
    return { rows, commanded: makeTimedPath(paths[paths.length - 1].map((p) => ({ ...p })), `${what} commanded path`), pathSource: 'commanded', warnings };
  }
  if (positioner.length === 0) throw new EchotrailError('E_PATH', `${what} holds neither a commanded path nor positioner records; give --commanded PATH.csv`);
  return { rows, commanded: positionerToPath(positioner, `${what} positioner records`, units), pathSource: 'positioner', warnings };
}
