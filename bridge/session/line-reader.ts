/**
 * Reads a file line by line from any byte offset, synchronously, in fixed-size chunks.
 * Used for the one full scan when a session opens and for the short reads after a seek, so a
 * seek costs one positioned read instead of a re-scan.
 */
import { readSync } from 'node:fs';

/** One raw line: its text (without '\n'), where it starts, its 1-based number. */
export interface RawLine {
  text: string;
  offset: number;
  line: number;
  /** Length in bytes, without the newline (text may differ in length: UTF-8, invalid bytes). */
  bytes: number;
  /** Set when the line was longer than the cap: text is empty and the line must be refused. */
  oversized?: number;
}

export interface LineReaderOptions {
  /** Bytes read per system call. */
  chunkBytes: number;
  /** Lines longer than this are reported as oversized instead of being held in memory. */
  maxLineBytes: number;
}

export function resolveLineReaderOptions(o: Partial<LineReaderOptions> = {}): LineReaderOptions {
  return { chunkBytes: o.chunkBytes ?? 256 * 1024, maxLineBytes: o.maxLineBytes ?? 16 * 1024 * 1024 };
}

const NL = 0x0a;

/**
 * Complete lines from `offset` (which must be a line start, numbered `firstLine`) to end of file.
 * Bytes after the last newline are a truncated line (a writer killed mid-line): they are not
 * yielded; `tail()` tells how many there were.
 */
export class LineReader {
  private readonly opts: LineReaderOptions;
  private tailBytes = 0;
  private tailLine = 0;

  constructor(private readonly fd: number, opts: Partial<LineReaderOptions> = {}) {
    this.opts = resolveLineReaderOptions(opts);
  }

  /** After iteration: the truncated last line, or null when the file ended with a newline. */
  tail(): { line: number; bytes: number } | null {
    return this.tailBytes > 0 ? { line: this.tailLine, bytes: this.tailBytes } : null;
  }

  *lines(offset: number, firstLine: number): Generator<RawLine> {
    const chunk = Buffer.allocUnsafe(this.opts.chunkBytes);
    let pending: Buffer[] = [];
    let pendingBytes = 0;
    let lineStart = offset;
    let lineNo = firstLine;
    let pos = offset;
    let skipping = false; // inside an oversized line: drop bytes until its newline
    this.tailBytes = 0;
    for (;;) {
      const n = readSync(this.fd, chunk, 0, chunk.length, pos);
      if (n === 0) break;
      let start = 0;
      for (let i = chunk.indexOf(NL, 0); i !== -1 && i < n; i = chunk.indexOf(NL, start)) {
        const len = pendingBytes + (i - start);
        if (skipping || len > this.opts.maxLineBytes) {
          yield { text: '', offset: lineStart, line: lineNo, bytes: pos + i - lineStart, oversized: pos + i - lineStart };
        } else {
          const part = chunk.subarray(start, i);
          const text = pendingBytes === 0 ? part.toString('utf8') : Buffer.concat([...pending, part]).toString('utf8');
          yield { text, offset: lineStart, line: lineNo, bytes: len };
        }
        pending = [];
        pendingBytes = 0;
        skipping = false;
        lineNo++;
        start = i + 1;
        lineStart = pos + start;
      }
      if (start < n) {
        const rest = n - start;
        if (!skipping && pendingBytes + rest <= this.opts.maxLineBytes) {
          pending.push(Buffer.from(chunk.subarray(start, n)));
        } else {
          skipping = true;
          pending = [];
        }
        pendingBytes += rest;
      }
      pos += n;
    }
    if (pendingBytes > 0) {
      this.tailBytes = pendingBytes;
      this.tailLine = lineNo;
    }
  }
}
