/**
 * Calibration and tuning inputs from a recorded session (bridge/session/reader.ts, public API
 * only: openSession, records, close): its raw detections, and the commanded path — the session's
 * commanded-path record, else the positioner's commanded samples. Raw detections, not the live
 * tracker's output, because calibration must not depend on the settings it is about to change.
 */
import { EchotrailError } from '../errors.ts';
import { openSession } from '../session/reader.ts';
import type { Detection } from '../types.ts';
import type { TimedPoint } from './path.ts';

export interface SessionRun {
  /** Detections in time order. */
  detections: Detection[];
  /** Commanded path (positioner frame), or null when the session holds none. */
  commanded: TimedPoint[] | null;
  /** Where the path came from. */
  pathSource: 'commanded' | 'positioner' | null;
  /** Things the user should know (bad lines skipped, several paths). */
  warnings: string[];
}

export async function readSessionRun(file: string): Promise<SessionRun> {
  const reader = await openSession(file);
  const detections: Detection[] = [];
  // By positioner: a bench with several names each (`pos … id=`); one path is one positioner's.
  const fromPositioner = new Map<string, TimedPoint[]>();
  let commanded: TimedPoint[] | null = null;
  const warnings: string[] = [];
  try {
    if (reader.badLineCount > 0) warnings.push(`${reader.badLineCount} bad line(s) in ${file} were skipped (first at line ${reader.badLines[0]?.line}: ${reader.badLines[0]?.reason})`);
    for (const { record } of reader.records(-Infinity)) {
      if (record.kind === 'detection') detections.push(record.detection);
      else if (record.kind === 'positioner') {
        const key = record.sample.target ?? '';
        let samples = fromPositioner.get(key);
        if (!samples) fromPositioner.set(key, (samples = []));
        samples.push({ timeS: record.sample.timeS, x: record.sample.cmdX, y: record.sample.cmdY });
      }
      else if (record.kind === 'commanded') {
        if (commanded) warnings.push(`${file} holds more than one commanded path; the last one is used`);
        commanded = record.path.map((p) => ({ timeS: p.timeS, x: p.x, y: p.y }));
      }
    }
  } finally {
    reader.close();
  }
  if (detections.length === 0) throw new EchotrailError('E_INPUT_EMPTY', `session ${file} holds no detections`);
  detections.sort((a, b) => a.timeS - b.timeS);
  const [first, ...others] = [...fromPositioner.keys()];
  if (!commanded && others.length) warnings.push(`${file} holds positioner samples of ${others.length + 1} positioners (${[first, ...others].join(', ')}); those of ${first} are used`);
  // Positioner samples may repeat a time; keep the last of each so the path is strictly ordered.
  const pos = (fromPositioner.get(first) ?? []).sort((a, b) => a.timeS - b.timeS).filter((p, i, all) => i === all.length - 1 || all[i + 1].timeS > p.timeS);
  const path = commanded ?? (pos.length >= 2 ? pos : null);
  return { detections, commanded: path, pathSource: commanded ? 'commanded' : path ? 'positioner' : null, warnings };
}
