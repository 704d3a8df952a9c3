/**
 * One line of a session file, validated: a record with its place in the file, the `end` summary,
 * or the reason it was refused (in plain words, for a BadLine).
 *
 * Detections are most of a session's lines, so they are checked by hand (same rules as the zod
 * schema in format.ts, which the tests hold them to); every other kind goes through zod.
 */
import { fromLine, sessionLine, type SessionSummary, type TimedRecord } from './format.ts';
import type { RawLine } from './line-reader.ts';
import { recordTime } from './record-time.ts';
import type { Detection } from '../types.ts';

type Parsed = TimedRecord | { end: SessionSummary; timeS: number } | string;

const DET_KEYS = new Set(['k', 'timeS', 'azimuthRad', 'rangeM', 'amplitude', 'phaseRad', 'line']);

/** A `det` line by hand: required finite numbers (range ≥ 0, amplitude > 0), optional phase and integer line number. */
function detection(o: Record<string, unknown>, raw: RawLine): Parsed | null {
  for (const key of ['timeS', 'azimuthRad', 'rangeM', 'amplitude'] as const) {
    if (typeof o[key] !== 'number' || !Number.isFinite(o[key])) return null; // let zod word the reason
  }
  if ((o.rangeM as number) < 0 || (o.amplitude as number) <= 0) return null; // out of bounds: zod words it
  if (o.phaseRad !== undefined && (typeof o.phaseRad !== 'number' || !Number.isFinite(o.phaseRad))) return null;
  if (o.line !== undefined && !Number.isInteger(o.line)) return null;
  for (const key in o) if (!DET_KEYS.has(key)) return null; // unknown keys: zod strips them, take its path
  const d: Detection = { timeS: o.timeS as number, azimuthRad: o.azimuthRad as number, rangeM: o.rangeM as number, amplitude: o.amplitude as number };
  if (o.phaseRad !== undefined) d.phaseRad = o.phaseRad as number;
  if (o.line !== undefined) d.line = o.line as number;
  return { timeS: d.timeS, record: { kind: 'detection', detection: d }, line: raw.line, offset: raw.offset };
}

/** Validates one raw record line; returns the record or the reason it was refused. */
export function parseSessionLine(raw: RawLine): Parsed {
  if (raw.oversized !== undefined) return `line of ${raw.oversized} bytes is too long`;
  let json: unknown;
  try {
    json = JSON.parse(raw.text);
  } catch {
    return 'not valid JSON';
  }
  if (json !== null && typeof json === 'object' && (json as { k?: unknown }).k === 'det') {
    const fast = detection(json as Record<string, unknown>, raw);
    if (fast) return fast;
  }
  const r = sessionLine.safeParse(json);
  if (!r.success) {
    const issue = r.error.issues[0];
    return `${issue.path.join('.') || 'record'}: ${issue.message}`;
  }
  const l = r.data;
  if (l.k === 'end') return { end: l.summary, timeS: l.timeS };
  const record = fromLine(l)!;
  return { timeS: recordTime(record) ?? l.timeS, record, line: raw.line, offset: raw.offset };
}
