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

/** One commanded path of the session: its target ('' when the run commands one, unnamed) and the path. */
export interface SessionPath {
  target: string;
  path: TimedPath;
}

/** What a session contributes. */
export interface SessionInput {
  rows: TrackRow[];
  /** Every target's commanded path, in the order the targets first appear. */
  paths: SessionPath[];
  /** Where the paths came from, for the summary. */
  pathSource: 'commanded' | 'positioner';
  warnings: string[];
}

/**
 * Read a session for comparison; `auto` prefers commanded-path records, else positioner records.
 * A run with several positioners or carriages gives one path each: the commanded-path records by
 * their `target` (a later record of a target replaces its earlier one), or the positioner
 * records by theirs.
 */
export async function readSessionInput(file: string, source: SessionPathSource = 'auto', units: Partial<UnitCheckOptions> = {}): Promise<SessionInput> {
  const reader = await openSession(file);
  const rows: TrackRow[] = [];
  const positioner = new Map<string, PositionerSample[]>();
  const commanded = new Map<string, { timeS: number; x: number; y: number }[]>();
  const replaced = new Set<string>();
  const warnings: string[] = [];
  try {
    if (reader.badLineCount > 0) warnings.push(`${reader.badLineCount} bad line(s) in the session were skipped (first at line ${reader.badLines[0]?.line}: ${reader.badLines[0]?.reason})`);
    for (const r of reader.records(-Infinity)) {
      const rec = r.record;
      if (rec.kind === 'track') rows.push(rowFromUpdate(rec.update));
      else if (rec.kind === 'positioner') {
        const key = rec.sample.target ?? '';
        let list = positioner.get(key);
        if (!list) positioner.set(key, (list = []));
        list.push(rec.sample);
      } else if (rec.kind === 'commanded') {
        const key = rec.target ?? '';
        if (commanded.has(key)) replaced.add(key);
        commanded.set(key, rec.path);
      }
    }
  } finally {
    reader.close();
  }
  rows.sort((a, b) => a.timeS - b.timeS);
  const what = `session ${file}`;
  const named = (t: string) => (t ? `target ${t}` : 'the commanded path');
  const useCommanded = source === 'commanded' || (source === 'auto' && commanded.size > 0);
  if (useCommanded) {
    if (commanded.size === 0) throw new EchotrailError('E_PATH', `${what} holds no commanded-path record; use --session-path positioner or give --commanded`);
    for (const t of replaced) warnings.push(`${what} holds several commanded-path records for ${named(t)}; the last one is used`);
    const paths = [...commanded].map(([target, pts]) => ({ target, path: makeTimedPath(pts.map((p) => ({ ...p })), `${what} commanded path${target ? ` of target ${target}` : ''}`) }));
    return { rows, paths, pathSource: 'commanded', warnings };
  }
  if (positioner.size === 0) throw new EchotrailError('E_PATH', `${what} holds neither a commanded path nor positioner records; give --commanded PATH.csv`);
  const paths = [...positioner].map(([target, samples]) => ({ target, path: positionerToPath(samples, `${what} positioner records${target ? ` of ${target}` : ''}`, units) }));
  return { rows, paths, pathSource: 'positioner', warnings };
}
