/**
 * The run time a record carries, when it carries one. Fixed-echo maps, commanded paths and notes
 * carry none of their own: the recorder stamps them with the time of the run when they arrived.
 */
import type { StoredRecord } from './format.ts';
import type { SourceRecord } from '../ingest/source.ts';

export function recordTime(rec: SourceRecord | StoredRecord): number | null {
  switch (rec.kind) {
    case 'detection': return rec.detection.timeS;
    case 'antenna':
    case 'positioner': return rec.sample.timeS;
    case 'track': return rec.update.timeS;
    case 'deletion': return rec.deletion.timeS;
    default: return null;
  }
}
