/**
 * The session file format, version 1 (prose and examples: docs/session-format.md).
 *
 * A session is UTF-8 JSON lines, append-only: line 1 is a self-describing header, every other
 * line is one record `{"k": <kind>, "timeS": <run time>, ...}`; a clean close appends an `end`
 * line with a summary. Whatever is read back is validated with these schemas.
 */
import { z } from 'zod';
import type { SourceRecord } from '../ingest/source.ts';
import { deletionWire, fixedEchoWire, pathPointWire, positionerWire, trackWire } from '../server/protocol.ts';

export const SESSION_FORMAT = 'echotrail-session';
export const SESSION_VERSION = 1;
/** File name suffix of session files. */
export const SESSION_SUFFIX = '.session.jsonl';

const finite = z.number().finite();

/** Units of every number in the file; written into the header so the file explains itself. */
export const SESSION_UNITS = {
  timeS: 's since the header startUtc (run time)',
  length: 'm; x, y in the radar frame: radar at the origin, y along the antenna zero reference',
  angle: 'rad, clockwise from +y, in [0, 2π)',
  velocity: 'm/s',
  covariance: 'm²',
  amplitude: "detector's linear units",
} as const;

/** One line of explanation per record kind, also written into the header. */
export const RECORD_KINDS = {
  det: 'detection: timeS, azimuthRad, rangeM, amplitude, phaseRad?, line? (source line number)',
  ant: 'antenna pointing / heartbeat: timeS, azimuthRad',
  pos: 'positioner: timeS, cmdX, cmdY (commanded), measX?, measY? (encoder), target? (which positioner/carriage, when several)',
  trk: 'track update: timeS, id, status, x, y, vx, vy, speed, headingRad, pxx, pxy, pyy, quality, moving, hits, misses, startS? (when the track began), measurement?, nis?',
  del: 'track deletion: timeS, id, reason',
  fix: 'fixed-echo map snapshot: timeS, echoes[] of {x, y, rangeM, azimuthRad, seen, amplitude}',
  cmd: 'commanded path (replaces the previous one of the same target): timeS, target? (which positioner/carriage, when several), path[] of {timeS, x, y}',
  note: 'operator or program note: timeS, text',
  end: 'clean close: timeS (run duration), summary {detections, tracks, lines, hasCommanded (cmd or pos records)}',
} as const;

export const sessionHeader = z.object({
  format: z.literal(SESSION_FORMAT),
  version: z.number().int().positive(),
  /** Human-readable run name. */
  name: z.string().max(200),
  /** Wall-clock time of run time 0, ISO 8601 UTC. */
  startUtc: z.iso.datetime(),
  source: z.object({ kind: z.string(), name: z.string() }),
  units: z.record(z.string(), z.string()),
  records: z.record(z.string(), z.string()),
  /** Bench and tracker settings in force, free-form JSON. */
  config: z.unknown(),
  /** Program that wrote the file. */
  writer: z.string(),
});
export type SessionHeader = z.infer<typeof sessionHeader>;

export const sessionSummary = z.object({
  detections: z.number().int().nonnegative(),
  tracks: z.number().int().nonnegative(),
  lines: z.number().int().nonnegative(),
  hasCommanded: z.boolean(),
});
export type SessionSummary = z.infer<typeof sessionSummary>;

const measurement = z.object({ timeS: finite, x: finite, y: finite, rxx: finite, rxy: finite, ryy: finite });

export const sessionLine = z.discriminatedUnion('k', [
  z.object({
    // Same bounds as the line protocol and the detections CSV: a range is never negative and an
    // echo has a positive amplitude.
    k: z.literal('det'), timeS: finite, azimuthRad: finite,
    rangeM: finite.min(0, 'range must not be negative'), amplitude: finite.positive('amplitude must be positive'),
    phaseRad: finite.optional(), line: z.number().int().optional(),
  }),
  z.object({ k: z.literal('ant'), timeS: finite, azimuthRad: finite }),
  positionerWire.extend({ k: z.literal('pos') }),
  trackWire.extend({ k: z.literal('trk'), measurement: measurement.optional(), nis: finite.optional() }),
  deletionWire.extend({ k: z.literal('del') }),
  z.object({ k: z.literal('fix'), timeS: finite, echoes: z.array(fixedEchoWire) }),
  z.object({ k: z.literal('cmd'), timeS: finite, target: z.string().min(1).max(64).optional(), path: z.array(pathPointWire) }),
  z.object({ k: z.literal('note'), timeS: finite, text: z.string() }),
  z.object({ k: z.literal('end'), timeS: finite, summary: sessionSummary }),
]);
export type SessionLine = z.infer<typeof sessionLine>;

/** What a session holds besides source records: notes. */
export type StoredRecord = SourceRecord | { kind: 'note'; text: string };

/** A record read back, with its place in the file. */
export interface TimedRecord {
  timeS: number;
  record: StoredRecord;
  /** 1-based line number. */
  line: number;
  /** Byte offset of the line's first byte. */
  offset: number;
}

/** The line object for a record; `timeS` is used by kinds that carry no time of their own. */
export function toLine(rec: StoredRecord, timeS: number): SessionLine {
  switch (rec.kind) {
    case 'detection': return { k: 'det', ...rec.detection };
    case 'antenna': return { k: 'ant', ...rec.sample };
    case 'positioner': return { k: 'pos', ...rec.sample };
    case 'track': return { k: 'trk', ...rec.update };
    case 'deletion': return { k: 'del', ...rec.deletion };
    case 'fixed-echoes': return { k: 'fix', timeS, echoes: rec.echoes };
    case 'commanded': return rec.target === undefined ? { k: 'cmd', timeS, path: rec.path } : { k: 'cmd', timeS, target: rec.target, path: rec.path };
    case 'note': return { k: 'note', timeS, text: rec.text };
  }
}

/** The record a validated line holds, or null for the `end` line. */
export function fromLine(l: SessionLine): StoredRecord | null {
  switch (l.k) {
    case 'det': { const { k: _k, ...detection } = l; return { kind: 'detection', detection }; }
    case 'ant': return { kind: 'antenna', sample: { timeS: l.timeS, azimuthRad: l.azimuthRad } };
    case 'pos': { const { k: _k, ...sample } = l; return { kind: 'positioner', sample }; }
    case 'trk': { const { k: _k, ...update } = l; return { kind: 'track', update }; }
    case 'del': return { kind: 'deletion', deletion: { timeS: l.timeS, id: l.id, reason: l.reason } };
    case 'fix': return { kind: 'fixed-echoes', echoes: l.echoes };
    case 'cmd': return l.target === undefined ? { kind: 'commanded', path: l.path } : { kind: 'commanded', path: l.path, target: l.target };
    case 'note': return { kind: 'note', text: l.text };
    case 'end': return null;
  }
}
