/**
 * Seeds for two-point track initiation. A detection that no track takes is kept here as a seed,
 * not yet a track; a track starts only when a later detection lies within reach of a seed (the
 * distance the fastest target covers in between, plus the measurement noise), and its first
 * velocity is the difference of the two. In dense clutter most leftover detections never pair, and
 * a seed costs a record in one grid cell instead of a filter and a wide gate.
 *
 * Seeds arrive in time order, so they also expire in order from the head of a queue.
 */
import type { Detection, Measurement } from '../types.ts';

export interface Seed {
  m: Measurement;
  d: Detection;
  /** Consumed by a pairing or expired. */
  dead: boolean;
}

export class SeedPool {
  private readonly cells = new Map<number, Seed[]>();
  private readonly queue: Seed[] = [];
  private head = 0;
  private readonly inv: number;

  /**
   * @param maxSpeedMps fastest expected target, m/s
   * @param lifeS a seed pairs with detections up to this much later, s
   * @param minGapS ...and no sooner than this, s: on a rotating antenna a reflector answers once
   *   per revolution, so two detections of one sweep are two reflectors (neighbours on a wall)
   */
  constructor(
    private readonly maxSpeedMps: number,
    private readonly lifeS: number,
    private readonly minGapS = 0,
  ) {
    // One cell spans a seed's reach before noise, so a look-up reads two or three cells a side.
    this.inv = 1 / Math.max(maxSpeedMps * lifeS + 0.3, 0.05);
  }

  private key(ix: number, iy: number): number {
    return (((ix + 16384) & 0x7fff) << 15) | ((iy + 16384) & 0x7fff);
  }

  add(m: Measurement, d: Detection): void {
    const s: Seed = { m, d, dead: false };
    const k = this.key(Math.floor(m.x * this.inv), Math.floor(m.y * this.inv));
    const c = this.cells.get(k);
    if (c) c.push(s);
    else this.cells.set(k, [s]);
    this.queue.push(s);
  }

  /**
   * Takes the seed that best explains `m` as the same reflector moved on: within
   * maxSpeed·Δt + 3σ (σ from both measurements' covariances), the nearest in units of that reach.
   */
  take(m: Measurement): Seed | null {
    this.expire(m.timeS);
    // The cells a seed in reach can be in: the square of the widest reach around m. That reach
    // adds 3σ of both detections' noise to the speed bound, which the cell size does not cover
    // (cross-range noise grows with range: 3σ passes 0.3 m beyond about 2.7 m at 1.5°). The
    // seed's σ is taken as up to twice m's (a seed farther out in range is noisier).
    const reachMax = this.maxSpeedMps * this.lifeS + 3 * Math.sqrt(5 * Math.max(m.rxx, m.ryy));
    const x0 = Math.floor((m.x - reachMax) * this.inv);
    const x1 = Math.floor((m.x + reachMax) * this.inv);
    const y0 = Math.floor((m.y - reachMax) * this.inv);
    const y1 = Math.floor((m.y + reachMax) * this.inv);
    let best: Seed | null = null;
    let bq = 1;
    for (let ix = x0; ix <= x1; ix++) {
      for (let iy = y0; iy <= y1; iy++) {
        const c = this.cells.get(this.key(ix, iy));
        if (!c) continue;
        for (const s of c) {
          const dt = m.timeS - s.m.timeS;
          if (s.dead || !(dt > 0) || dt < this.minGapS) continue;
          const sig = Math.sqrt(Math.max(s.m.rxx + m.rxx, s.m.ryy + m.ryy));
          const reach = this.maxSpeedMps * dt + 3 * sig;
          const dx = m.x - s.m.x;
          const dy = m.y - s.m.y;
          const q = Math.sqrt(dx * dx + dy * dy) / reach;
          if (q < bq) {
            bq = q;
            best = s;
          }
        }
      }
    }
    if (best) best.dead = true;
    return best;
  }

  /** Drops seeds older than lifeS before `nowS`. */
  expire(nowS: number): void {
    const q = this.queue;
    while (this.head < q.length && nowS - q[this.head].m.timeS > this.lifeS) {
      const s = q[this.head++];
      const k = this.key(Math.floor(s.m.x * this.inv), Math.floor(s.m.y * this.inv));
      const c = this.cells.get(k);
      if (c) {
        const i = c.indexOf(s);
        if (i >= 0) c.splice(i, 1);
        if (c.length === 0) this.cells.delete(k);
      }
    }
    if (this.head > 4096 && this.head > q.length / 2) {
      q.splice(0, this.head);
      this.head = 0;
    }
  }

  /** Seeds held. */
  get size(): number {
    return this.queue.length - this.head;
  }
}
