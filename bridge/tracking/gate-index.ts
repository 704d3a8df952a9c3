/**
 * Where each track's gate can reach: the spatial index the tracker gates against.
 *
 * A track is written into the grid with a disc that holds its gate over a time span, from its
 * filter's time to a horizon (`reachUntilS`). A gate grows as the prediction ages (an IMM's
 * manoeuvre model fastest), so a disc drawn for the next expected detection no longer holds the
 * gate of a track that missed a scan: before gating detections up to time T, `refresh(T)` redraws
 * the disc of every track whose horizon has passed, oldest horizon first from a min-heap, so a
 * batch costs the number of stale tracks, not of all tracks. The grid then returns every track
 * whose gate may admit a detection (a superset), and the gate test decides.
 *
 * The disc is the smaller of two that must both hold a detection the track may take (gating.ts):
 * the χ² gate's, and the speed bound's (the fastest target's travel since the last hit, plus 3σ
 * of noise). Both also grow with the detection's own noise, which the index cannot know in
 * advance; but a detection's noise depends only on its range (cross-range noise is r·σ_azimuth),
 * so the disc is drawn for the noise at the farthest range it reaches (`noiseAtRange`), found by
 * a short fixed-point iteration: wider noise, wider disc, farther range.
 */
import type { Measurement } from '../types.ts';
import { enclosingDisc, type GateDisc, type TrackFilter } from './filter-types.ts';
import { MinHeap } from './min-heap.ts';
import { SpatialGrid } from './spatial-grid.ts';

/** What the index needs of a track. */
export interface IndexedTrack {
  readonly id: number;
  readonly filter: TrackFilter;
  /** Largest eigenvalue of its detections' noise covariance, m². */
  readonly lastRMax: number;
  /** Its latest hits, the last one last (the speed bound starts there). */
  readonly recent: readonly Measurement[];
  /** Time up to which its disc in the index holds its gate, s (written by the index). */
  reachUntilS: number;
}

/**
 * Safety factor on the radius: between the three times a disc is computed at, the gate radius
 * may grow slightly faster than linearly (a sum of terms in dt, dt², dt⁴ under a square root).
 */
const MARGIN = 1.05;

// Disc scratch of place(): consumed before the next call.
const D0: GateDisc = { x: 0, y: 0, r: 0 };
const D1: GateDisc = { x: 0, y: 0, r: 0 };
const D2: GateDisc = { x: 0, y: 0, r: 0 };
const D_OUT: GateDisc = { x: 0, y: 0, r: 0 };

/**
 * A range a little beyond `r` for the noise look-up: 5 % and 5 cm of headroom. Without it the
 * fixed point is approached from below and never quite reached (measured: five discs per
 * placement instead of one or two).
 */
function farther(r: number): number {
  return 1.05 * r + 0.05;
}

export class GateIndex<T extends IndexedTrack = IndexedTrack> {
  /**
   * The grid holds slot numbers, not tracks, and each slot's disc is kept packed here
   * (x, y, r in `discs`): a query tests every candidate the grid returns against its disc, and
   * reading those from one typed array instead of from each track object is what keeps a query
   * cheap when a detection's cell holds dozens of candidates (measured: 45 candidates per query
   * on the crowded benchmark, 10 of them inside their discs).
   */
  private readonly grid: SpatialGrid<number>;
  private discs = new Float64Array(3 * 256);
  private readonly bySlot: (T | undefined)[] = [];
  private readonly slotOf = new Map<T, number>();
  private readonly freeSlots: number[] = [];
  private readonly found: T[] = [];
  /** Tracks on the end of their discs; an entry is stale once the track was placed again. */
  private readonly due = new MinHeap<T>();

  /**
   * @param cellM grid cell, m: about a typical gate radius
   * @param gamma gate threshold (χ², 2 dof)
   * @param spanS how far ahead of its filter time a track's disc is drawn, s (one interval: the
   *   next expected detection; refresh() extends it for overdue tracks)
   * @param maxSpeedMps fastest expected target, m/s (the speed bound of gating.ts)
   * @param noiseAtRange largest eigenvalue of a detection's noise covariance at a range, m²
   *   (non-decreasing in range); read at every placement, so it may follow the noise estimate
   */
  constructor(
    cellM: number,
    private readonly gamma: number,
    private readonly spanS: number,
    private readonly maxSpeedMps: number,
    private readonly noiseAtRange: (rangeM: number) => number,
  ) {
    this.grid = new SpatialGrid<number>(cellM);
  }

  /** Writes (or rewrites) the track's disc from its filter's time to `untilS` (default: one span ahead). */
  place(t: T, untilS = t.filter.timeS + this.spanS): void {
    const f = t.filter;
    const t0 = f.timeS;
    const t1 = Math.max(untilS, t0);
    const h = t.recent[t.recent.length - 1];
    // First guess of the noise: a little beyond the far edge of the speed bound around the last
    // hit, which holds the disc in most cases, so the loop below usually stops at once.
    const hMax = Math.max(h.rxx, h.ryy);
    const guess = this.maxSpeedMps * Math.max(0, t1 - h.timeS) + 3 * Math.sqrt(2 * hMax);
    let noise = Math.max(t.lastRMax, this.noiseAtRange(farther(Math.sqrt(h.x * h.x + h.y * h.y) + guess)));
    let d = this.disc(t, t0, t1, h, noise);
    for (let k = 0; ; k++) {
      const edge = Math.sqrt(d.x * d.x + d.y * d.y) + d.r;
      if (this.noiseAtRange(edge) <= noise) break;
      // The disc grows with the noise and the noise with the disc's far edge; taking the noise
      // a little farther out than the edge settles it in one more step (the disc grows far
      // less than the headroom). Not settled after a few steps (never seen): twice as far out.
      noise = k < 4 ? this.noiseAtRange(farther(edge)) : this.noiseAtRange(2 * edge);
      d = this.disc(t, t0, t1, h, noise);
      if (k >= 4) break;
    }
    t.reachUntilS = t1;
    const slot = this.slotFor(t);
    const k = 3 * slot;
    this.discs[k] = d.x;
    this.discs[k + 1] = d.y;
    this.discs[k + 2] = d.r;
    this.grid.set(slot, d.x, d.y, d.r);
    this.due.push(t1, t);
  }

  /** The track's slot, a new one (a freed one first) for a track not yet placed. */
  private slotFor(t: T): number {
    let slot = this.slotOf.get(t);
    if (slot !== undefined) return slot;
    slot = this.freeSlots.length ? this.freeSlots.pop()! : this.bySlot.length;
    this.slotOf.set(t, slot);
    this.bySlot[slot] = t;
    if (3 * slot + 3 > this.discs.length) {
      const grown = new Float64Array(2 * this.discs.length);
      grown.set(this.discs);
      this.discs = grown;
    }
    return slot;
  }

  /**
   * The smaller of the χ² disc and the speed-bound disc over [t0, t1], for detections whose noise
   * covariance has largest eigenvalue at most `noise`.
   */
  private disc(t: T, t0: number, t1: number, h: Measurement, noise: number): GateDisc {
    const f = t.filter;
    const g = this.gamma;
    const speedR = this.maxSpeedMps * Math.max(0, t1 - h.timeS) + 3 * Math.sqrt(Math.max(h.rxx, h.ryy) + noise);
    const out = D_OUT;
    // The gate is widest at the far end of the span: when that disc alone is no smaller than
    // the speed bound's, so is the disc holding all three, and the other two need not be drawn
    // (the usual case for an IMM, whose manoeuvre model's gate outgrows the speed bound).
    const last = f.gateDisc(t1, g, noise, D1);
    let useChi = last.r * MARGIN < speedR;
    let chi = last;
    if (useChi) {
      chi = enclosingDisc(enclosingDisc(f.gateDisc(t0, g, noise, D0), f.gateDisc(0.5 * (t0 + t1), g, noise, D2), D0), last, D0);
      useChi = chi.r * MARGIN < speedR;
    }
    out.x = useChi ? chi.x : h.x;
    out.y = useChi ? chi.y : h.y;
    out.r = useChi ? chi.r * MARGIN : speedR;
    return out;
  }


  /**
   * Redraws every track whose disc ends before `nowS` so that it holds until a quarter span past
   * `nowS`: an overdue track is redrawn a few times per interval while it stays overdue, each
   * time with a disc no larger than the wait so far needs.
   */
  refresh(nowS: number, live: ReadonlyMap<number, T>): void {
    while (this.due.minKey < nowS) {
      const at = this.due.minKey;
      const t = this.due.pop()!;
      // Stale heap entries (the track was placed again, or is gone) are skipped.
      if (t.reachUntilS !== at || live.get(t.id) !== t) continue;
      this.place(t, nowS + 0.25 * this.spanS);
    }
  }

  remove(t: T): void {
    const slot = this.slotOf.get(t);
    if (slot === undefined) return;
    this.grid.remove(slot);
    this.slotOf.delete(t);
    this.bySlot[slot] = undefined;
    this.freeSlots.push(slot);
  }

  /** The disc the track is placed with (null if it is not in the index). */
  discOf(t: T): GateDisc | null {
    const slot = this.slotOf.get(t);
    if (slot === undefined) return null;
    const k = 3 * slot;
    return { x: this.discs[k], y: this.discs[k + 1], r: this.discs[k + 2] };
  }

  /** Tracks whose disc holds (x, y); the array is reused by the next call. */
  query(x: number, y: number): readonly T[] {
    const out = this.found;
    out.length = 0;
    const cand = this.grid.query(x, y);
    const discs = this.discs;
    for (let i = 0; i < cand.length; i++) {
      const k = 3 * cand[i];
      const dx = x - discs[k];
      const dy = y - discs[k + 1];
      const r = discs[k + 2];
      if (dx * dx + dy * dy <= r * r) out.push(this.bySlot[cand[i]]!);
    }
    return out;
  }

  get size(): number {
    return this.grid.size;
  }
}
