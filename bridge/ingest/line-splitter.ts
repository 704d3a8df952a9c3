/**
 * Splits a byte stream into lines with a hard cap on line length, so a device that sends junk
 * without newlines cannot grow a buffer without bound. A line over the cap is refused once (its
 * number, the reason, its first bytes) and the rest of it, up to the next newline, is dropped.
 */

export interface SplitLine {
  /** 1-based number, counted since the splitter was made. */
  line: number;
  /** The line without '\n' (latin1: one char per byte, so non-ASCII bytes stay visible to the parser). */
  text: string;
  /** Set when the line was longer than the cap: the count of bytes seen before giving up. */
  oversized?: number;
}

export class LineSplitter {
  private parts: Buffer[] = [];
  private size = 0;
  private skipping = false;
  private lineNo = 0;

  /** @param maxLineBytes longest accepted line, newline excluded. */
  constructor(private readonly maxLineBytes: number) {}

  /** Lines completed by `chunk`, in order. */
  push(chunk: Buffer): SplitLine[] {
    const out: SplitLine[] = [];
    let start = 0;
    for (;;) {
      const nl = chunk.indexOf(0x0a, start);
      const end = nl === -1 ? chunk.length : nl;
      const piece = chunk.subarray(start, end);
      if (!this.skipping) {
        if (this.size + piece.length > this.maxLineBytes) {
          // Report now, not at the newline: junk may never send one.
          out.push({ line: ++this.lineNo, text: Buffer.concat([...this.parts, piece]).subarray(0, 200).toString('latin1'), oversized: this.size + piece.length });
          this.skipping = true;
          this.parts = [];
          this.size = 0;
        } else if (piece.length) {
          this.parts.push(Buffer.from(piece));
          this.size += piece.length;
        }
      }
      if (nl === -1) break;
      if (!this.skipping) out.push({ line: ++this.lineNo, text: Buffer.concat(this.parts).toString('latin1') });
      this.parts = [];
      this.size = 0;
      this.skipping = false;
      start = nl + 1;
    }
    return out;
  }

  /**
   * Forgets an unfinished line (the device went away mid-line) and returns its number and byte
   * count, or null when there was none. The cut-off line takes its number, so the next complete
   * line does not repeat it in the refused-line reports.
   */
  reset(): { line: number; bytes: number } | null {
    const n = this.size;
    this.parts = [];
    this.size = 0;
    this.skipping = false;
    return n > 0 ? { line: ++this.lineNo, bytes: n } : null;
  }
}
