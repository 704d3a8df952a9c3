/**
 * The detections CSV (the `track` input, docs/conventions.md): a header row, columns
 * `time_s,azimuth_deg,range_m,amplitude` in any order, other columns ignored, rows in time order.
 *
 * `readDetectionsCsv` streams it (csv-parse) into `Detection`s. Unusable input (nothing in it, a
 * required column missing) throws; a bad row is skipped and counted with its line number, and the
 * rows around it still come through. `writeDetectionsCsv` writes the same format.
 */
import { createReadStream, createWriteStream } from 'node:fs';
import { resolve } from 'node:path';
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import { parse } from 'csv-parse';
import { EchotrailError } from '../errors.ts';
import type { Detection } from '../types.ts';

export interface DetectionsCsvOptions {
  /** Largest plausible range, m; rows beyond it are skipped (default 1000). */
  maxRangeM?: number;
  /** Amplitude to use when the file has no `amplitude` column; unset means the column is required. */
  defaultAmplitude?: number;
  /**
   * A row more than this far ahead of a later row that falls back between it and the rows before
   * (up to three such rows in a row) is a bad timestamp and is skipped, s (default 1).
   */
  spikeS?: number;
}

export interface SkipReport {
  /** Data rows seen (header excluded). */
  rows: number;
  accepted: number;
  skipped: number;
  /** The first skipped row: its 1-based line in the file and why (the head of skippedLines). */
  readonly firstSkipped: { line: number; reason: string } | null;
  /** Skipped rows counted by kind of fault. */
  reasons: Map<string, number>;
  /**
   * The earliest skipped rows, line order, at most SKIP_DETAIL_LIMIT + 1 of them (bounded memory on
   * a file of millions of bad rows; the extra one tells that more follow).
   */
  skippedLines: { line: number; reason: string }[];
  /** The skipped row latest in the file so far (a replay shows it as the last bad line). */
  lastSkipped: { line: number; reason: string } | null;
  /**
   * Rows kept whose azimuth lay outside [0, 360)° and was wrapped into it (−30 → 330, 400 → 40):
   * a valid angle, so the row is not lost, but files should hold [0, 360) (docs/conventions.md),
   * so it is said; and the first such line.
   */
  azimuthWrapped: number;
  firstWrappedLine: number | null;
}

/** Skipped rows listed one per line after the summary line; the rest are counted. */
export const SKIP_DETAIL_LIMIT = 20;

export interface DetectionsCsvReader extends AsyncIterable<Detection> {
  /** Updated while iterating; complete once the iteration ends. */
  readonly report: SkipReport;
  /** The same detections in arrays (one per chunk read): cheaper per row for fast consumers. */
  batches(): AsyncIterable<Detection[]>;
}

export function resolveDetectionsCsvOptions(o: DetectionsCsvOptions = {}): { maxRangeM: number; defaultAmplitude: number | null; spikeS: number } {
  return { maxRangeM: o.maxRangeM ?? 1000, defaultAmplitude: o.defaultAmplitude ?? null, spikeS: o.spikeS ?? 1 };
}

const REQUIRED = ['time_s', 'azimuth_deg', 'range_m', 'amplitude'] as const;
// Strict decimal: Number() would accept '', ' ', '0x1f' and 'Infinity'.
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
const TWO_PI = 2 * Math.PI;
const DEG = Math.PI / 180;
/**
 * Rows far ahead of the rows around them that are skipped as one corrupted run at most (a
 * longer run in order is a real jump in time); as many as a live serial stream needs to confirm
 * a clock restart (clock-guard.ts).
 */
const SPIKE_ROWS = 3;
/** Powers of ten exactly representable as doubles (10²² is the last). */
const P10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));

/** `"1.5"` → `1.5`: quoting is off in the parser (see below), so a quoted cell keeps its quotes. */
function unquote(cell: string): string {
  return cell.length >= 2 && cell.startsWith('"') && cell.endsWith('"') ? cell.slice(1, -1).trim() : cell;
}

/**
 * A cell of exactly the DECIMAL form → its value, anything else → NaN, in one pass over the
 * characters. It runs three or four times a row, and the regular expression followed by Number()
 * (a second pass and a runtime call) was the reader's largest cost outside csv-parse; with this
 * the reader does about a fifth more rows per second. Up to 15 significant digits and a net
 * power of ten within ±22, the integer of the digits and 10^k are exact doubles, so one division
 * or multiplication is correctly rounded and equals Number(cell) (Clinger's fast path:
 * W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990); beyond that,
 * Number(cell) itself.
 */
function decimal(cell: string): number {
  const n = cell.length;
  let i = 0;
  let c = n > 0 ? cell.charCodeAt(0) : 0;
  const negative = c === 45; // -
  if (negative || c === 43) i = 1; // +
  let mantissa = 0;
  let nDigits = 0;
  let fraction = 0;
  for (; i < n; i++) {
    c = cell.charCodeAt(i) - 48;
    if (c < 0 || c > 9) break;
    mantissa = mantissa * 10 + c;
    nDigits++;
  }
  if (i < n && cell.charCodeAt(i) === 46) {
    for (i++; i < n; i++) {
      c = cell.charCodeAt(i) - 48;
      if (c < 0 || c > 9) break;
      mantissa = mantissa * 10 + c;
      nDigits++;
      fraction++;
    }
  }
  if (nDigits === 0) return NaN;
  let exponent = 0;
  if (i < n) {
    c = cell.charCodeAt(i);
    if (c !== 101 && c !== 69) return NaN; // e E
    i++;
    const expNegative = i < n && cell.charCodeAt(i) === 45;
    if (expNegative || (i < n && cell.charCodeAt(i) === 43)) i++;
    if (i === n) return NaN; // '1e', '1e+'
    if (n - i > 4) return DECIMAL.test(cell) ? Number(cell) : NaN; // an exponent of many digits: Number() copes
    for (; i < n; i++) {
      c = cell.charCodeAt(i) - 48;
      if (c < 0 || c > 9) return NaN;
      exponent = exponent * 10 + c;
    }
    if (expNegative) exponent = -exponent;
  }
  const k = exponent - fraction;
  if (nDigits > 15 || k > 22 || k < -22) return Number(cell);
  const v = k === 0 ? mantissa : k > 0 ? mantissa * P10[k] : mantissa / P10[-k];
  return negative ? -v : v;
}

function num(cell: string | undefined): number {
  if (cell === undefined) return NaN;
  const v = decimal(cell);
  if (!Number.isNaN(v)) return v;
  // Trimming and unquoting only on the slow path: csv-parse's own trim halves throughput.
  const t = unquote(cell.trim());
  return t !== cell ? decimal(t) : NaN;
}

/** A report of nothing read yet. */
export function newSkipReport(): SkipReport {
  return {
    rows: 0, accepted: 0, skipped: 0, reasons: new Map(), skippedLines: [], lastSkipped: null, azimuthWrapped: 0, firstWrappedLine: null,
    get firstSkipped() {
      return this.skippedLines[0] ?? null;
    },
  };
}

/**
 * Reads a detections CSV from a path ('-' for stdin) or a stream.
 *
 * Line numbers are counted here rather than taken from csv-parse's `info`, which costs about half
 * the throughput. Quoting is off, so one physical line is one record: a stray quote costs its own
 * line only, and a quoted cell spanning lines (not expected in a numeric format) costs its
 * continuation lines, each reported with its number.
 */
export function readDetectionsCsv(input: string | NodeJS.ReadableStream, options?: DetectionsCsvOptions): DetectionsCsvReader {
  const opts = resolveDetectionsCsvOptions(options);
  const report = newSkipReport();
  const kept = report.skippedLines;
  const name = typeof input === 'string' ? input : 'input';
  const skip = (line: number, kind: string, detail: string) => {
    report.skipped++;
    report.reasons.set(kind, (report.reasons.get(kind) ?? 0) + 1);
    if (!report.lastSkipped || line > report.lastSkipped.line) report.lastSkipped = { line, reason: detail };
    // Insert in line order (csv-parse reports malformed records as it parses ahead of us, so they
    // can come early), keeping only the earliest ones.
    if (kept.length <= SKIP_DETAIL_LIMIT || line < kept[kept.length - 1].line) {
      let i = kept.length;
      while (i > 0 && kept[i - 1].line > line) i--;
      kept.splice(i, 0, { line, reason: detail });
      if (kept.length > SKIP_DETAIL_LIMIT + 1) kept.pop();
    }
  };
  async function* batches(): AsyncGenerator<Detection[]> {
    const source: NodeJS.ReadableStream = typeof input !== 'string' ? input : input === '-' ? process.stdin : createReadStream(input);
    const brokenLines: number[] = [];
    const parser = parse({
      // Quoting off: every field of this format is a number, and with quoting on one stray `"`
      // would swallow the good lines after it into one field. One physical line = one record.
      quote: false,
      // Tried on the 100-target file of bench/track-cli.bench.ts: escape: null, an explicit
      // record_delimiter and latin1 decoding gained nothing beyond noise, and 'data' events in
      // place of read() were slower. csv-parse's byte loop is most of the reader's time now.
      relax_column_count: true, skip_empty_lines: false, bom: true, skip_records_with_error: true,
      on_skip: (err) => {
        const line = typeof err?.lines === 'number' ? err.lines : 0;
        brokenLines.push(line);
        report.rows++;
        skip(line, 'malformed CSV', `malformed CSV (${err?.message ?? 'unreadable'})`);
        return undefined;
      },
    });
    let failure: Error | null = null;
    let ended = false;
    let wake: (() => void) | null = null;
    // The full path: the command may run in another directory than the user's (npm run).
    const where = typeof input === 'string' && input !== '-' ? resolve(input) : name;
    source.on('error', (err: Error) => parser.destroy(new EchotrailError('E_PATH', `cannot read ${where}: ${(err as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : err.message}`, { cause: err })));
    parser.on('readable', () => wake?.());
    parser.on('end', () => ((ended = true), wake?.()));
    parser.on('error', (err: Error) => ((failure = err), wake?.()));
    source.pipe(parser);
    /** Each required column's index, and how many fields a row needs to hold them all. */
    let col: (Record<(typeof REQUIRED)[number], number> & { fields: number }) | null = null;
    // Time order: good rows are released SPIKE_ROWS rows late, so that a short run of corrupted
    // timestamps far in the future (…, 12.0, 9e6, 9e6, 12.1, …) is what gets skipped, not every
    // row up to that time; SPIKE_ROWS + 1 rows in order past a jump make it a real one.
    let lastTime = -Infinity;
    const held: Detection[] = [];
    const release = (d: Detection, out: Detection[]) => {
      lastTime = d.timeS;
      report.accepted++;
      out.push(d);
    };
    const hold = (d: Detection, out: Detection[]) => {
      held.push(d);
      if (held.length > SPIKE_ROWS) release(held.shift()!, out);
    };
    const order = (d: Detection, out: Detection[]) => {
      const newest = held.length ? held[held.length - 1].timeS : lastTime;
      if (d.timeS >= newest) return hold(d, out);
      // The row falls back. Held rows far ahead of it, while it is not before what was released,
      // were the spike: they go, and the row stays unless it falls back before the rest too.
      if (d.timeS >= lastTime) {
        let k = held.length;
        while (k > 0 && held[k - 1].timeS - d.timeS > opts.spikeS) k--;
        for (const h of held.splice(k)) skip(h.line as number, 'time jumps ahead', `time_s ${h.timeS} jumps ahead of the rows around it (next ${d.timeS})`);
        if (d.timeS >= (held.length ? held[held.length - 1].timeS : lastTime)) return hold(d, out);
      }
      skip(d.line as number, 'time going backwards', `time_s ${d.timeS} is earlier than the previous row's ${newest}`);
    };
    let nextLine = 1;
    // What to say about a cell that did not parse: a missing cell and an empty one read differently.
    const cell = (record: string[], c: number) => (c >= record.length ? '(missing)' : record[c].trim() === '' ? '(empty)' : JSON.stringify(record[c].slice(0, 40)));
    const handle = (record: string[], out: Detection[]) => {
      while (brokenLines.length && brokenLines[0] <= nextLine) (brokenLines.shift(), nextLine++);
      const line = nextLine;
      nextLine++;
      if (record.length === 1 && record[0].trim() === '') return; // blank line
      if (!col) {
        const names = record.map((c) => unquote(c.trim()).toLowerCase());
        const idx = (n: string) => names.indexOf(n);
        const missing = REQUIRED.filter((n) => idx(n) < 0 && !(n === 'amplitude' && opts.defaultAmplitude !== null));
        if (missing.length) throw new EchotrailError('E_INPUT_COLUMNS', `${name}: header lacks ${missing.join(', ')} (line ${line} must name the columns time_s,azimuth_deg,range_m,amplitude, in any order)${delimiterHint(record)}`);
        col = { time_s: idx('time_s'), azimuth_deg: idx('azimuth_deg'), range_m: idx('range_m'), amplitude: idx('amplitude'), fields: 0 };
        col.fields = 1 + Math.max(col.time_s, col.azimuth_deg, col.range_m, col.amplitude);
        return;
      }
      report.rows++;
      // A row cut short (a truncated write, a lost delimiter) said as such: "amplitude (missing) is
      // not a number" named a symptom, not the fault.
      if (record.length < col.fields) {
        skip(line, 'short row', `the row has ${record.length} field${record.length === 1 ? '' : 's'} where the header's columns need ${col.fields}`);
        return;
      }
      const t = num(record[col.time_s]);
      const az = num(record[col.azimuth_deg]);
      const r = num(record[col.range_m]);
      const a = col.amplitude < 0 ? (opts.defaultAmplitude as number) : num(record[col.amplitude]);
      if (!Number.isFinite(t)) skip(line, 'bad time_s', `time_s ${cell(record, col.time_s)} is not a number`);
      else if (!Number.isFinite(az)) skip(line, 'bad azimuth_deg', `azimuth_deg ${cell(record, col.azimuth_deg)} is not a number`);
      else if (!Number.isFinite(r)) skip(line, 'bad range_m', `range_m ${cell(record, col.range_m)} is not a number`);
      else if (!Number.isFinite(a)) skip(line, 'bad amplitude', `amplitude ${cell(record, col.amplitude)} is not a number`);
      else if (t < 0) skip(line, 'negative time', `time_s ${t} is negative`);
      else if (r < 0 || r > opts.maxRangeM) skip(line, 'range out of bounds', `range_m ${r} is outside 0–${opts.maxRangeM} m`);
      else if (a <= 0) skip(line, 'amplitude not positive', `amplitude ${a} is not positive`);
      else {
        if (az < 0 || az >= 360) {
          report.azimuthWrapped++;
          report.firstWrappedLine ??= line;
        }
        let rad = (((az % 360) + 360) % 360) * DEG;
        if (rad >= TWO_PI) rad = 0; // rounding of a tiny negative angle
        order({ timeS: t, azimuthRad: rad, rangeM: r, amplitude: a, line }, out);
      }
    };
    // Pull records synchronously with read() and hand them over in arrays: one await per chunk
    // instead of one per row.
    try {
      for (;;) {
        const out: Detection[] = [];
        let rec: string[] | null;
        while ((rec = parser.read() as string[] | null) !== null) handle(rec, out);
        if (out.length) yield out;
        if (failure) throw failure;
        if (ended) {
          if (held.length) {
            const last: Detection[] = [];
            for (const d of held.splice(0)) release(d, last);
            yield last;
          }
          break;
        }
        if (out.length === 0) {
          await new Promise<void>((resolve) => (wake = resolve));
          wake = null;
        }
      }
    } finally {
      // The consumer stopped early or an error ended the read: release the file (a stream the
      // caller handed in is only unpiped; it is theirs to close).
      if (!ended) {
        source.unpipe(parser);
        parser.destroy();
        if (typeof input === 'string' && input !== '-') (source as ReturnType<typeof createReadStream>).destroy();
      }
    }
    if (!col) throw new EchotrailError('E_INPUT_EMPTY', `${name} is empty: expected a header row time_s,azimuth_deg,range_m,amplitude and data rows`);
    if (report.rows === 0) throw new EchotrailError('E_INPUT_EMPTY', `${name} has a header but no data rows`);
    if (report.accepted === 0) throw new EchotrailError('E_INPUT_ROW', `${name}: none of its ${report.rows} rows is usable; ${formatSkipReport(report)}`);
  }
  async function* rows(): AsyncGenerator<Detection> {
    for await (const batch of batches()) yield* batch;
  }
  return { report, batches, [Symbol.asyncIterator]: rows };
}

/**
 * A header read as one cell that holds the column names split by ';' or a tab is a file written
 * with another delimiter (a spreadsheet in a decimal-comma locale writes ';'): say so.
 */
export function delimiterHint(header: string[]): string {
  const text = header.join(',');
  for (const [sep, what] of [[';', 'semicolons'], ['\t', 'tabs']] as const) {
    const names = text.split(sep).map((c) => unquote(c.trim()).toLowerCase());
    if (names.length > 1 && REQUIRED.some((n) => names.includes(n))) return `; the header looks separated by ${what}: the file must be comma-separated (with '.' as the decimal point)`;
  }
  return '';
}

/** `N rows had azimuth_deg outside [0, 360): wrapped into it (first at line L)`, or ''. */
export function formatWrapNote(report: SkipReport): string {
  const n = report.azimuthWrapped;
  if (n === 0) return '';
  return `${n} row${n === 1 ? '' : 's'} had azimuth_deg outside [0, 360) and ${n === 1 ? 'was' : 'were'} wrapped into it (first at line ${report.firstWrappedLine}); the rows were kept`;
}

/** `N rows skipped: first at line L: reason`, or '' when nothing was skipped. */
export function formatSkipReport(report: SkipReport): string {
  if (report.skipped === 0 || !report.firstSkipped) return '';
  const n = report.skipped;
  return `${n} row${n === 1 ? '' : 's'} skipped: first at line ${report.firstSkipped.line}: ${report.firstSkipped.reason}`;
}

/**
 * The skipped rows after the first, one line each (`line L: reason`), at most `max` of them, then
 * `… and N more`: the summary line (formatSkipReport, whose format docs/conventions.md binds)
 * names only the first.
 */
export function formatSkipDetails(report: SkipReport, max = SKIP_DETAIL_LIMIT): string[] {
  const rest = report.skippedLines.slice(1, 1 + max).map((s) => `line ${s.line}: ${s.reason}`);
  const more = report.skipped - 1 - rest.length;
  if (more > 0) rest.push(`… and ${more} more`);
  return rest;
}

/** One CSV line of a detection, degrees at the edge; 0.1 mm, 1e-4° and 1 µs resolution. */
export function detectionCsvLine(d: Detection): string {
  return `${d.timeS.toFixed(6)},${((d.azimuthRad * 180) / Math.PI).toFixed(4)},${d.rangeM.toFixed(4)},${Number(d.amplitude.toPrecision(6))}`;
}

export const DETECTIONS_CSV_HEADER = 'time_s,azimuth_deg,range_m,amplitude';

/**
 * Writes detections to a path or stream, honouring back-pressure so that a generator of millions
 * of rows never piles up in memory. Returns the number of rows written. Ends streams it opened.
 */
export async function writeDetectionsCsv(rows: Iterable<Detection> | AsyncIterable<Detection>, out: string | Writable): Promise<number> {
  return writeCsvLines(out, DETECTIONS_CSV_HEADER, rows, detectionCsvLine);
}

/** Generic back-pressured CSV writer shared with the simulator's truth and commanded files. */
export async function writeCsvLines<T>(out: string | Writable, header: string, rows: Iterable<T> | AsyncIterable<T>, format: (row: T) => string): Promise<number> {
  const stream = typeof out === 'string' ? createWriteStream(out) : out;
  let n = 0;
  let buf = header + '\n';
  for await (const row of rows) {
    buf += format(row) + '\n';
    n++;
    // Batch lines into ~64 kB writes: one write per row costs more than the formatting.
    if (buf.length > 65536) {
      if (!stream.write(buf)) await once(stream, 'drain');
      buf = '';
    }
  }
  if (buf) stream.write(buf);
  if (typeof out === 'string') {
    stream.end();
    await once(stream, 'finish');
  }
  return n;
}
