/**
 * Seek index of a session: a checkpoint every `intervalS` of run time holding the byte offset
 * of the first line at or after that time and the run state just before it. Seeking is then a
 * binary search plus reading at most one interval (plus the history window) of lines.
 */
import { RunState } from './run-state.ts';
import type { StoredRecord } from './format.ts';

export interface Checkpoint {
  /** Run time this checkpoint stands for: every line before `offset` is earlier (in file order). */
  timeS: number;
  /** Byte offset of the first line at or after timeS. */
  offset: number;
  /** Its 1-based line number. */
  line: number;
  /** State after applying every record before `offset`. */
  state: RunState;
}

export class SeekIndex {
  readonly checkpoints: Checkpoint[] = [];
  private readonly state = new RunState();
  private next = 0;

  /** @param intervalS run time between checkpoints, s. */
  constructor(readonly intervalS: number, firstOffset: number, firstLine: number) {
    this.checkpoints.push({ timeS: 0, offset: firstOffset, line: firstLine, state: new RunState() });
    this.next = intervalS;
  }

  /** Feed records in file order, before they are applied. */
  add(timeS: number, record: StoredRecord, offset: number, line: number): void {
    if (timeS >= this.next) {
      // A gap in the run makes one checkpoint for the whole gap, at the boundary just passed.
      const k = Math.floor(timeS / this.intervalS);
      this.checkpoints.push({ timeS: k * this.intervalS, offset, line, state: this.state.clone() });
      this.next = (k + 1) * this.intervalS;
    }
    this.state.apply(record);
  }

  /** The last checkpoint at or before `timeS` (the first one when timeS precedes everything). */
  find(timeS: number): Checkpoint {
    const cps = this.checkpoints;
    let lo = 0;
    let hi = cps.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (cps[mid].timeS <= timeS) lo = mid;
      else hi = mid - 1;
    }
    return cps[lo];
  }
}
