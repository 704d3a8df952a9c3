/**
 * The tracks CSV written by `track` (columns fixed by docs/conventions.md plus the
 * measurement columns the RTS smoother of bridge/compare needs). Degrees at the edge; measurement
 * columns and nis are empty on a coast.
 *
 * Rows are formatted straight into bytes (`TracksCsvEncoder`): `toFixed` and `toPrecision` are
 * runtime calls (about 0.15 µs and, with the round trip through Number, 0.7 µs each here), and
 * with 17 numbers a row they were nearly all the cost of writing the file (about 100k rows/s,
 * against 2M rows/s for writing the same bytes preformatted); bytes also spare the string
 * concatenation and the UTF-8 encoding at `write()`. The digits are exactly those of
 * `toFixed(d)` and of `Number(v.toPrecision(6)).toString()`: the fast path scales by a power of
 * ten with one correctly rounded operation and hands any value within rounding error of a tie,
 * or too large or too small for it, to those functions themselves.
 */
import type { TrackUpdate } from '../types.ts';

export const TRACKS_CSV_COLUMNS = [
  'time_s', 'track_id', 'x_m', 'y_m', 'vx_mps', 'vy_mps', 'speed_mps', 'heading_deg',
  'status', 'quality', 'range_m', 'azimuth_deg', 'meas_x_m', 'meas_y_m', 'meas_sxx', 'meas_sxy', 'meas_syy', 'nis',
] as const;

export const TRACKS_CSV_HEADER = TRACKS_CSV_COLUMNS.join(',');

const RAD = 180 / Math.PI;
/** Powers of ten exactly representable as doubles (10²² is the last). */
const P10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));
/**
 * |computed − exact| of one correctly rounded product s is at most s·2⁻⁵³ ≈ s·1.1e-16; a
 * fractional part closer to ½ than four times that could round either way, so it goes to the
 * runtime's exact conversion instead.
 */
const TIE = 4.5e-16;
/** The largest scaled value whose digits the fast path writes (exact integer arithmetic, < 2⁵⁰). */
const MAX_SCALED = 1e15;
const COMMA = 44;
const NL = 10;
const MINUS = 45;
const DOT = 46;
const ZERO = 48;
/** Room for one row on the fast path: 17 numbers of at most 32 bytes each, commas, the status aside. */
const ROW_BYTES = 1024;

/** Copies an ASCII string (a fallback number) byte by byte: shorter than a Buffer.write call for a few characters. */
function ascii(b: Uint8Array, p: number, s: string): number {
  for (let i = 0; i < s.length; i++) b[p++] = s.charCodeAt(i);
  return p;
}

/**
 * Non-negative integer n < 2⁵⁰ in decimal, at least `min` digits, a point before the last `point`
 * of them, nine digits at a time in 32-bit integer arithmetic.
 */
function digits(b: Uint8Array, p: number, n: number, min: number, point: number): number {
  let len = 1;
  while (len < 16 && n >= P10[len]) len++;
  if (len < min) len = min;
  const end = p + len + (point > 0 ? 1 : 0);
  let q = end;
  const hi = n >= 1e9 ? Math.floor(n / 1e9) : 0;
  let part = (n - hi * 1e9) | 0;
  for (let i = 0; i < len; i++) {
    if (i === point && point > 0) b[--q] = DOT;
    if (i === 9) part = hi | 0;
    const m = (part / 10) | 0;
    b[--q] = ZERO + part - m * 10;
    part = m;
  }
  return end;
}

/** `v.toFixed(d)`, or nothing for a non-finite v. */
function fixed(b: Uint8Array, p: number, v: number, d: number): number {
  if (!Number.isFinite(v)) return p;
  const a = v < 0 ? -v : v;
  const s = a * P10[d];
  if (s < MAX_SCALED) {
    const whole = Math.floor(s);
    const off = s - whole - 0.5;
    const tie = s * TIE;
    if (off > tie || off < -tie) {
      // toFixed writes the sign of a negative value even when it rounds to zero ("-0.0000").
      if (v < 0) b[p++] = MINUS;
      return digits(b, p, off > 0 ? whole + 1 : whole, d + 1, d);
    }
  }
  return ascii(b, p, v.toFixed(d));
}

/**
 * `Number(v.toPrecision(6)).toString()` (six significant digits, then the shortest form), or
 * nothing for a non-finite v. Six digits of a double are its shortest form once trailing zeros
 * are dropped, laid out by Number::toString's rules (ECMA-262 §6.1.6.1.20).
 */
function sig6(b: Uint8Array, p: number, v: number): number {
  if (!Number.isFinite(v)) return p;
  if (v === 0) {
    b[p++] = ZERO;
    return p;
  }
  const a = v < 0 ? -v : v;
  let e = Math.floor(Math.log10(a));
  let s = scale(a, 5 - e);
  // log10 can land one off next to a power of ten.
  if (s < 1e5) s = scale(a, 5 - --e);
  else if (s >= 1e6) s = scale(a, 5 - ++e);
  const whole = Math.floor(s);
  const off = s - whole - 0.5;
  const tie = s * TIE;
  if (!(s >= 1e5 && s < 1e6) || (off <= tie && off >= -tie)) return ascii(b, p, Number(v.toPrecision(6)).toString());
  let n = off > 0 ? whole + 1 : whole;
  if (n === 1e6) ((n = 1e5), e++);
  let nd = 6;
  while (n % 10 === 0) ((n /= 10), nd--);
  if (v < 0) b[p++] = MINUS;
  const k = e + 1; // the value is 0.d₁d₂…d_nd × 10^k
  if (nd <= k && k <= 21) {
    p = digits(b, p, n, nd, 0);
    for (let i = nd; i < k; i++) b[p++] = ZERO;
  } else if (k > 0 && k <= 21) {
    p = digits(b, p, n, nd, nd - k);
  } else if (k > -6 && k <= 0) {
    b[p++] = ZERO;
    b[p++] = DOT;
    for (let i = k; i < 0; i++) b[p++] = ZERO;
    p = digits(b, p, n, nd, 0);
  } else {
    p = digits(b, p, n, nd, nd - 1);
    b[p++] = 101; // e
    b[p++] = k - 1 < 0 ? MINUS : 43;
    p = digits(b, p, Math.abs(k - 1), 1, 0);
  }
  return p;
}

/** a·10^k with one correctly rounded operation, or NaN where 10^|k| is not exact. */
function scale(a: number, k: number): number {
  if (k >= 0) return k <= 22 ? a * P10[k] : NaN;
  return k >= -22 ? a / P10[-k] : NaN;
}

/** String(v) for the track id: digits directly for the usual small non-negative integer. */
function integer(b: Uint8Array, p: number, v: number): number {
  return Number.isInteger(v) && v >= 0 && v < MAX_SCALED ? digits(b, p, v, 1, 0) : ascii(b, p, String(v));
}

/**
 * Formats tracks CSV rows into a byte buffer that the caller hands to a stream in large pieces
 * (`take()`); a new buffer is started after each piece, since the stream may still hold the last.
 */
export class TracksCsvEncoder {
  private buf: Buffer;
  private pos = 0;
  private readonly statusBytes = new Map<string, Uint8Array>();

  /** `capacity`: the bytes the caller means to gather before taking them (it grows if need be). */
  constructor(private readonly capacity = 65536) {
    this.buf = Buffer.allocUnsafe(capacity + ROW_BYTES);
  }

  /** Bytes formatted and not yet taken. */
  get length(): number {
    return this.pos;
  }

  /** The header row. */
  header(): void {
    this.ensure(TRACKS_CSV_HEADER.length + 1);
    this.pos = ascii(this.buf, this.pos, TRACKS_CSV_HEADER);
    this.buf[this.pos++] = NL;
  }

  /**
   * One row. range_m and azimuth_deg are the track's estimated position in polar form (azimuth
   * clockwise from +y, [0, 360)). Compact fixed point: 0.1 mm, 1 mm/s, six significant digits
   * of the covariance are far below the bench's noise.
   */
  add(u: TrackUpdate): void {
    const status = this.status(u.status);
    this.ensure(ROW_BYTES + status.length);
    const b = this.buf;
    let p = this.pos;
    p = fixed(b, p, u.timeS, 6);
    b[p++] = COMMA;
    p = integer(b, p, u.id);
    b[p++] = COMMA;
    p = fixed(b, p, u.x, 4);
    b[p++] = COMMA;
    p = fixed(b, p, u.y, 4);
    b[p++] = COMMA;
    p = fixed(b, p, u.vx, 4);
    b[p++] = COMMA;
    p = fixed(b, p, u.vy, 4);
    b[p++] = COMMA;
    p = fixed(b, p, u.speed, 4);
    b[p++] = COMMA;
    p = fixed(b, p, u.headingRad * RAD, 2);
    b[p++] = COMMA;
    for (let i = 0; i < status.length; i++) b[p++] = status[i];
    b[p++] = COMMA;
    p = fixed(b, p, u.quality, 3);
    b[p++] = COMMA;
    p = fixed(b, p, Math.hypot(u.x, u.y), 4);
    b[p++] = COMMA;
    let az = Math.atan2(u.x, u.y) * RAD;
    if (az < 0) az += 360;
    p = fixed(b, p, az, 3);
    b[p++] = COMMA;
    const m = u.measurement;
    if (m) {
      p = fixed(b, p, m.x, 4);
      b[p++] = COMMA;
      p = fixed(b, p, m.y, 4);
      b[p++] = COMMA;
      p = sig6(b, p, m.rxx);
      b[p++] = COMMA;
      p = sig6(b, p, m.rxy);
      b[p++] = COMMA;
      p = sig6(b, p, m.ryy);
      b[p++] = COMMA;
      if (u.nis !== undefined) p = fixed(b, p, u.nis, 3);
    } else {
      for (let i = 0; i < 5; i++) b[p++] = COMMA;
    }
    b[p++] = NL;
    this.pos = p;
  }

  /** One row as a string without its line break, formatted at the end of the buffer and dropped again. */
  line(u: TrackUpdate): string {
    const start = this.pos;
    this.add(u);
    const s = this.buf.toString('utf8', start, this.pos - 1);
    this.pos = start;
    return s;
  }

  /** The bytes formatted so far (a view, not a copy); the encoder continues in a new buffer. */
  take(): Buffer {
    const out = this.buf.subarray(0, this.pos);
    this.buf = Buffer.allocUnsafe(Math.max(this.capacity, this.pos) + ROW_BYTES);
    this.pos = 0;
    return out;
  }

  private ensure(bytes: number): void {
    if (this.pos + bytes <= this.buf.length) return;
    const bigger = Buffer.allocUnsafe(2 * (this.pos + bytes));
    this.buf.copy(bigger, 0, 0, this.pos);
    this.buf = bigger;
  }

  /** A status word as UTF-8 bytes, encoded once per kind. */
  private status(s: string): Uint8Array {
    let bytes = this.statusBytes.get(s);
    if (!bytes) this.statusBytes.set(s, (bytes = Buffer.from(String(s), 'utf8')));
    return bytes;
  }
}

const scratch = new TracksCsvEncoder(ROW_BYTES);

/** One row as a string, without its line break: the same bytes the encoder writes. */
export function trackCsvLine(u: TrackUpdate): string {
  return scratch.line(u);
}
