/**
 * The acquisition line protocol: ASCII lines from the bench hardware to the bridge.
 * Full description with examples: docs/line-protocol.md.
 *
 *   det <t_s> <azimuth_deg> <range_m> <amplitude> [ph=<phase_deg>] [iq=<I>,<Q>]|<crc>
 *   ant <t_s> <azimuth_deg>|<crc>
 *   pos <t_s> <cmd_x_m> <cmd_y_m> [<meas_x_m> <meas_y_m>] [id=<name>]|<crc>
 *
 * <crc> is CRC-16/CCITT-FALSE (crc16.ts) of every byte before the '|', as four hex digits.
 * parseLine never throws: anything it cannot vouch for comes back as a BadLine with a reason.
 */
import type { BadLine, SourceRecord } from './source.ts';
import type { AntennaSample, Detection, PositionerSample } from '../types.ts';
import { crc16CcittFalse, crcHex } from './crc16.ts';

/** Longest line parseLine accepts, characters without the newline. The longest legal line is ~100. */
export const MAX_LINE_LENGTH = 256;

/** The records the hardware sends; the other SourceRecord kinds only come from sessions. */
export type WireRecord = Extract<SourceRecord, { kind: 'detection' | 'antenna' | 'positioner' }>;

export type ParseResult = { ok: true; record: WireRecord } | { ok: false; bad: BadLine };

const DEG = Math.PI / 180;
// Plain decimal or exponent notation only: no NaN, Infinity, hex, or empty strings.
const NUMBER_RE = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d{1,3})?$/;
const PRINTABLE_RE = /^[\x20-\x7e]*$/;

function bad(line: number, reason: string, text: string): ParseResult {
  return { ok: false, bad: { line, reason, text: text.slice(0, 200) } };
}

/** Parses one decimal token; returns an error string instead of a number when it is not one. */
function num(token: string | undefined, what: string): number | string {
  if (token === undefined) return `missing ${what}`;
  if (!NUMBER_RE.test(token)) return `${what} is not a number: '${token.slice(0, 20)}'`;
  const v = Number(token);
  return Number.isFinite(v) ? v : `${what} is out of range: '${token.slice(0, 20)}'`;
}

/** Parses positional numbers; the first failure becomes the reason. */
function nums(tokens: string[], names: string[]): number[] | string {
  const out: number[] = [];
  for (let i = 0; i < names.length; i++) {
    const v = num(tokens[i], names[i]);
    if (typeof v === 'string') return v;
    out.push(v);
  }
  return out;
}

function parseDetection(f: string[]): Detection | string {
  const v = nums(f, ['t_s', 'azimuth_deg', 'range_m', 'amplitude']);
  if (typeof v === 'string') return v;
  const [timeS, azDeg, rangeM, amplitude] = v;
  if (timeS < 0) return 't_s is negative';
  if (azDeg < 0 || azDeg >= 360) return `azimuth_deg ${azDeg} outside [0, 360)`;
  if (rangeM < 0) return `range_m ${rangeM} is negative`;
  if (amplitude <= 0) return `amplitude ${amplitude} is not positive`;
  const det: Detection = { timeS, azimuthRad: azDeg * DEG, rangeM, amplitude };
  const seen = new Set<string>();
  for (const opt of f.slice(4)) {
    const eq = opt.indexOf('=');
    const key = eq > 0 ? opt.slice(0, eq) : '';
    if (key !== 'ph' && key !== 'iq') return `unknown field '${opt.slice(0, 20)}'`;
    if (seen.has('ph') || seen.has('iq')) return 'give one of ph= or iq=, once';
    seen.add(key);
    const val = opt.slice(eq + 1);
    if (key === 'ph') {
      const ph = num(val, 'ph');
      if (typeof ph === 'string') return ph;
      if (ph < -180 || ph > 180) return `ph ${ph} outside [-180, 180]`;
      det.phaseRad = ph * DEG;
    } else {
      const parts = val.split(',');
      if (parts.length !== 2) return 'iq needs two numbers: iq=I,Q';
      const iq = nums(parts, ['I', 'Q']);
      if (typeof iq === 'string') return iq;
      if (iq[0] === 0 && iq[1] === 0) return 'iq=0,0 has no phase';
      // Phase of the complex sample I + jQ (common practice).
      det.phaseRad = Math.atan2(iq[1], iq[0]);
    }
  }
  return det;
}

function parseAntenna(f: string[]): AntennaSample | string {
  if (f.length !== 2) return `ant takes 2 fields, got ${f.length}`;
  const v = nums(f, ['t_s', 'azimuth_deg']);
  if (typeof v === 'string') return v;
  if (v[0] < 0) return 't_s is negative';
  if (v[1] < 0 || v[1] >= 360) return `azimuth_deg ${v[1]} outside [0, 360)`;
  return { timeS: v[0], azimuthRad: v[1] * DEG };
}

/** A positioner's name on the wire: what a session's commanded-path target may hold, without spaces. */
export const POSITIONER_ID_RE = /^[A-Za-z0-9_.-]{1,32}$/;

function parsePositioner(fields: string[]): PositionerSample | string {
  // A trailing id= names the positioner (benches with several carriages).
  let f = fields;
  let target: string | undefined;
  const last = f[f.length - 1];
  if (f.filter((t) => t.startsWith('id=')).length > 1) return 'id= given more than once';
  if (last?.startsWith('id=')) {
    target = last.slice(3);
    if (!POSITIONER_ID_RE.test(target)) return `id '${target.slice(0, 40)}' must be 1–32 letters, digits, '_', '.' or '-'`;
    f = f.slice(0, -1);
  }
  if (f.length !== 3 && f.length !== 5) return `pos takes 3 or 5 numbers (then optionally id=<name>), got ${f.length}`;
  const names = ['t_s', 'cmd_x_m', 'cmd_y_m', 'meas_x_m', 'meas_y_m'].slice(0, f.length);
  const v = nums(f, names);
  if (typeof v === 'string') return v;
  if (v[0] < 0) return 't_s is negative';
  const s: PositionerSample = { timeS: v[0], cmdX: v[1], cmdY: v[2] };
  if (v.length === 5) {
    s.measX = v[3];
    s.measY = v[4];
  }
  if (target !== undefined) s.target = target;
  return s;
}

/** Parses one line (without its newline; a trailing '\r' is tolerated). `lineNo` is 1-based. */
export function parseLine(text: string, lineNo: number): ParseResult {
  const line = text.endsWith('\r') ? text.slice(0, -1) : text;
  if (line.length === 0) return bad(lineNo, 'empty line', line);
  if (line.length > MAX_LINE_LENGTH) return bad(lineNo, `line longer than ${MAX_LINE_LENGTH} characters`, line);
  if (!PRINTABLE_RE.test(line)) return bad(lineNo, 'non-printable or non-ASCII characters', line);
  const bar = line.lastIndexOf('|');
  if (bar < 0) return bad(lineNo, "no checksum ('|' and four hex digits at the end)", line);
  const body = line.slice(0, bar);
  const crcText = line.slice(bar + 1);
  if (!/^[0-9A-Fa-f]{4}$/.test(crcText)) return bad(lineNo, `malformed checksum '${crcText.slice(0, 8)}'`, line);
  const want = crcHex(crc16CcittFalse(body));
  if (crcText.toUpperCase() !== want) return bad(lineNo, `checksum mismatch: line says ${crcText}, content gives ${want}`, line);
  const tokens = body.split(' ');
  if (tokens.some((t) => t.length === 0)) return bad(lineNo, 'fields must be separated by single spaces', line);
  const [type, ...fields] = tokens;
  let result: WireRecord | string;
  if (type === 'det') {
    const d = parseDetection(fields);
    result = typeof d === 'string' ? d : { kind: 'detection', detection: { ...d, line: lineNo } };
  } else if (type === 'ant') {
    const a = parseAntenna(fields);
    result = typeof a === 'string' ? a : { kind: 'antenna', sample: a };
  } else if (type === 'pos') {
    const p = parsePositioner(fields);
    result = typeof p === 'string' ? p : { kind: 'positioner', sample: p };
  } else {
    result = `unknown record type '${type.slice(0, 10)}'`;
  }
  return typeof result === 'string' ? bad(lineNo, `${type}: ${result}`, line) : { ok: true, record: result };
}

/** Extra wire-only content for encodeLine: raw I/Q instead of a phase. */
export interface EncodeExtras {
  /** Send the detection's phase as this I/Q pair (the parser derives the phase from it). */
  iq?: { i: number; q: number };
}

/** Wraps an angle in radians to [0, 360) degrees at the printed precision (4 decimals). */
function azText(rad: number): string {
  let deg = ((rad / DEG) % 360 + 360) % 360;
  if (Number(deg.toFixed(4)) >= 360) deg = 0;
  return deg.toFixed(4);
}

/**
 * Encodes one record as a line, checksum included, without the newline.
 * Precision: time 1 µs, azimuth 1e-4°, lengths 0.1 mm, phase 0.01°, amplitude 6 significant digits.
 */
export function encodeLine(record: WireRecord, extras: EncodeExtras = {}): string {
  let body: string;
  if (record.kind === 'detection') {
    const d = record.detection;
    body = `det ${d.timeS.toFixed(6)} ${azText(d.azimuthRad)} ${d.rangeM.toFixed(4)} ${Number(d.amplitude.toPrecision(6))}`;
    if (extras.iq) body += ` iq=${Number(extras.iq.i.toPrecision(6))},${Number(extras.iq.q.toPrecision(6))}`;
    else if (d.phaseRad !== undefined) body += ` ph=${(d.phaseRad / DEG).toFixed(2)}`;
  } else if (record.kind === 'antenna') {
    body = `ant ${record.sample.timeS.toFixed(6)} ${azText(record.sample.azimuthRad)}`;
  } else {
    const s = record.sample;
    body = `pos ${s.timeS.toFixed(6)} ${s.cmdX.toFixed(4)} ${s.cmdY.toFixed(4)}`;
    if (s.measX !== undefined && s.measY !== undefined) body += ` ${s.measX.toFixed(4)} ${s.measY.toFixed(4)}`;
    if (s.target !== undefined) body += ` id=${s.target}`;
  }
  return `${body}|${crcHex(crc16CcittFalse(body))}`;
}
