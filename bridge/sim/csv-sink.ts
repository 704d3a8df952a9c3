/**
 * Output files of the simulator: truth and commanded CSVs, and a small buffered sink that
 * respects back-pressure, so one pass over `iterateRun` can feed several files at once.
 */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import type { Writable } from 'node:stream';
import type { CommandedPoint, TruthSample } from './run.ts';

export const TRUTH_CSV_HEADER = 'time_s,target_id,x_m,y_m,vx_mps,vy_mps';
export const COMMANDED_CSV_HEADER = 'time_s,target_id,x_m,y_m';

/** Truth row, radar frame; positions to 0.1 mm, speeds to 0.1 mm/s. */
export function truthCsvLine(s: TruthSample): string {
  return `${s.timeS.toFixed(6)},${s.targetId},${s.x.toFixed(4)},${s.y.toFixed(4)},${s.vx.toFixed(4)},${s.vy.toFixed(4)}`;
}

/** Commanded row, positioner frame. */
export function commandedCsvLine(targetId: number, p: CommandedPoint): string {
  return `${p.timeS.toFixed(6)},${targetId},${p.x.toFixed(4)},${p.y.toFixed(4)}`;
}

/** Line-oriented CSV writer with a 64 kB buffer. '-' writes to stdout. */
export class CsvSink {
  private readonly stream: Writable;
  private readonly owned: boolean;
  private buf: string;
  /** Data lines written so far. */
  lines = 0;

  constructor(target: string | Writable, header: string) {
    this.owned = typeof target === 'string' && target !== '-';
    this.stream = typeof target !== 'string' ? target : target === '-' ? process.stdout : createWriteStream(target);
    this.buf = header + '\n';
  }

  /** Adds a line; resolves at once unless the buffer had to wait for the stream to drain. */
  async push(line: string): Promise<void> {
    this.buf += line + '\n';
    this.lines++;
    if (this.buf.length > 65536) await this.flush();
  }

  private async flush(): Promise<void> {
    const ok = this.stream.write(this.buf);
    this.buf = '';
    if (!ok) await once(this.stream, 'drain');
  }

  /** Writes what is left and, for files it opened, closes them. */
  async close(): Promise<void> {
    if (this.buf) await this.flush();
    if (this.owned) {
      this.stream.end();
      await once(this.stream, 'finish');
    }
  }
}
