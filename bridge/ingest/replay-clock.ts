/**
 * The clock a replay runs on. Injected so tests drive time by hand instead of waiting for it.
 */

export interface ReplayClock {
  /** Monotonic milliseconds (performance.now() in production). */
  now(): number;
  /** Calls `fn` after about `ms` milliseconds; returns a handle for clear(). */
  set(fn: () => void, ms: number): unknown;
  /** Cancels a pending set(). */
  clear(handle: unknown): void;
}

export const systemClock: ReplayClock = {
  now: () => performance.now(),
  set: (fn, ms) => setTimeout(fn, ms),
  clear: (h) => clearTimeout(h as NodeJS.Timeout),
};

/**
 * A clock that only moves when told: advance(ms) runs, in time order, every timer that falls due.
 * For tests and for rendering a replay faster than real time.
 */
export class ManualClock implements ReplayClock {
  private t = 0;
  private seq = 0;
  private timers = new Map<number, { at: number; fn: () => void }>();

  now(): number {
    return this.t;
  }

  set(fn: () => void, ms: number): unknown {
    const id = ++this.seq;
    this.timers.set(id, { at: this.t + Math.max(0, ms), fn });
    return id;
  }

  clear(handle: unknown): void {
    this.timers.delete(handle as number);
  }

  /** Timers waiting. */
  pending(): number {
    return this.timers.size;
  }

  /** Moves time forward by `ms`, firing due timers (including ones they set) in order. */
  advance(ms: number): void {
    const end = this.t + ms;
    for (;;) {
      let nextId = -1;
      let nextAt = Infinity;
      for (const [id, tm] of this.timers) if (tm.at < nextAt || (tm.at === nextAt && id < nextId)) [nextId, nextAt] = [id, tm.at];
      if (nextId < 0 || nextAt > end) break;
      const tm = this.timers.get(nextId)!;
      this.timers.delete(nextId);
      this.t = Math.max(this.t, tm.at);
      tm.fn();
    }
    this.t = end;
  }
}
