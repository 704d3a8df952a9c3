/**
 * Tells a stale line from a hardware clock restart on a live serial stream.
 *
 * One old line (a stray retransmission, a buffer flushed late) must not split a live recording
 * into two sessions; a power-cycled or reset device, whose clock starts again near zero, must.
 * So a line earlier than the latest good time by more than `backS` is held, not acted upon:
 * - if the next line is in step with the run again, the held lines were stale: they are refused;
 * - if `confirmLines` such lines come in a row, consistent among themselves (each within `backS`
 *   of the one before), the restart is confirmed: they are released in order, and the latest
 *   good time starts again from them.
 * At most `confirmLines - 1` lines are ever held, so memory stays bounded whatever comes in.
 */

/** A live record this much older than the run's latest time is out of order for the run, s. */
export const CLOCK_BACK_S = 2;
/** Consecutive earlier lines that confirm the hardware's clock restarted. */
export const CLOCK_RESTART_LINES = 3;

/** One line held or refused, with the time it carried. */
export interface Timed<T> {
  item: T;
  timeS: number;
}

/** What to do after one line. */
export interface GuardStep<T> {
  /** Lines refused as out of order (held lines that no restart confirmed), with the run's latest time then. */
  refused: Timed<T>[];
  /** The run's latest good time when `refused` were judged, s. */
  refusedFromS: number;
  /** Lines to pass on, in arrival order. */
  accepted: T[];
  /** True when `accepted` begins a new run: the clock restart was confirmed. */
  restart: boolean;
}

export class ClockGuard<T> {
  private lastS = -Infinity;
  private held: Timed<T>[] = [];

  /**
   * @param backS how far back of the latest good time a line may still be in order, s
   * @param confirmLines consecutive earlier lines that confirm a restart (at least 1)
   */
  constructor(
    private readonly backS = CLOCK_BACK_S,
    private readonly confirmLines = CLOCK_RESTART_LINES,
  ) {}

  /** The latest good time of the run, s (-Infinity before the first line). */
  get latestS(): number {
    return this.lastS;
  }

  /** Lines currently held awaiting confirmation. */
  get heldCount(): number {
    return this.held.length;
  }

  /** Judges one line; `timeS` null for a line that carries no time (always passed on). */
  push(item: T, timeS: number | null): GuardStep<T> {
    const step: GuardStep<T> = { refused: [], refusedFromS: this.lastS, accepted: [], restart: false };
    if (timeS === null) {
      step.accepted.push(item);
      return step;
    }
    if (timeS >= this.lastS - this.backS) {
      // In step with the run: whatever was held was stale.
      step.refused = this.held;
      this.held = [];
      this.lastS = Math.max(this.lastS, timeS);
      step.accepted.push(item);
      return step;
    }
    const prev = this.held[this.held.length - 1];
    if (prev && Math.abs(timeS - prev.timeS) > this.backS) {
      // Earlier, but not in step with the held lines either: those were stale on their own.
      step.refused = this.held;
      this.held = [];
    }
    this.held.push({ item, timeS });
    if (this.held.length >= this.confirmLines) {
      step.restart = true;
      step.accepted = this.held.map((h) => h.item);
      this.lastS = Math.max(...this.held.map((h) => h.timeS));
      this.held = [];
    }
    return step;
  }

  /** Gives up the held lines (the port closed): none confirmed a restart, so they are refused. */
  drain(): Timed<T>[] {
    const out = this.held;
    this.held = [];
    return out;
  }
}
