/**
 * One line of a session file, validated: a record with its place in the file, the `end` summary,
 * or the reason it was refused (in plain words, for a BadLine).
 */
import { fromLine, sessionLine, type SessionSummary, type TimedRecord } from './format.ts';
import type { RawLine } from './line-reader.ts';
import { recordTime } from './record-time.ts';

/** Validates one raw record line; returns the record or the reason it was refused. */
export function parseSessionLine(raw: RawLine): TimedRecord | { end: SessionSummary; timeS: number } | string {
  if (raw.oversized !== undefined) return `line of ${raw.oversized} bytes is too long`;
  let json: unknown;
  try {
    json = JSON.parse(raw.text);
  } catch {
    return 'not valid JSON';
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
