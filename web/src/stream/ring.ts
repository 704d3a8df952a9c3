/**
 * Fixed-capacity column ring buffer for one track's history.
 *
 * Columns are typed arrays so 50 tracks × 5,000 points cost a few MB and no per-point objects.
 * Every pushed point gets a sequence number that never repeats; the plan view keys its trail
 * chunks on it, so a chunk knows whether its points are still held after old ones fall out.
 */
export interface HistoryPoint {
  timeS: number;
  x: number;
  y: number;
  /** m/s; NaN when unknown (e.g. history that arrived without velocity). */
  speed: number;
  /** radians clockwise from +y; NaN when unknown. */
  headingRad: number;
}

export class HistoryRing {
  readonly capacity: number;
  readonly timeS: Float64Array;
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly speed: Float64Array;
  readonly headingRad: Float64Array;
  /** Total points ever pushed; the newest point has sequence `pushed - 1`. */
  pushed = 0;

  constructor(capacity: number) {
    if (!Number.isInteger(capacity) || capacity < 1) throw new RangeError(`capacity must be a positive integer, got ${capacity}`);
    this.capacity = capacity;
    this.timeS = new Float64Array(capacity);
    this.x = new Float64Array(capacity);
    this.y = new Float64Array(capacity);
    this.speed = new Float64Array(capacity);
    this.headingRad = new Float64Array(capacity);
  }

  /** Number of points currently held. */
  get length(): number {
    return Math.min(this.pushed, this.capacity);
  }

  /** Sequence number of the oldest point still held. */
  get firstSeq(): number {
    return this.pushed - this.length;
  }

  push(p: HistoryPoint): void {
    const i = this.pushed % this.capacity;
    this.timeS[i] = p.timeS;
    this.x[i] = p.x;
    this.y[i] = p.y;
    this.speed[i] = p.speed;
    this.headingRad[i] = p.headingRad;
    this.pushed++;
  }

  /** Storage slot of a sequence number; throws if it is no longer (or not yet) held. */
  slot(seq: number): number {
    if (seq < this.firstSeq || seq >= this.pushed) throw new RangeError(`sequence ${seq} not held (have ${this.firstSeq}..${this.pushed - 1})`);
    return seq % this.capacity;
  }

  /** The point with this sequence number, as a fresh object (for tests and tooltips, not hot loops). */
  at(seq: number): HistoryPoint {
    const i = this.slot(seq);
    return { timeS: this.timeS[i], x: this.x[i], y: this.y[i], speed: this.speed[i], headingRad: this.headingRad[i] };
  }

  /** The newest point, or undefined when empty. */
  last(): HistoryPoint | undefined {
    return this.pushed === 0 ? undefined : this.at(this.pushed - 1);
  }

  /** Sequence of the first held point with time ≥ t (binary search; times are pushed in order). */
  seqAtOrAfter(t: number): number {
    let lo = this.firstSeq;
    let hi = this.pushed;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (this.timeS[mid % this.capacity] < t) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  }

  clear(): void {
    this.pushed = 0;
  }
}
