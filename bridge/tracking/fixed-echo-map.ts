/**
 * Fixed-echo map: persistent stationary reflectors (cable joints, mounts, walls).
 *
 * The map learns from detections directly, not from tracks: every detection that no moving track
 * took joins the nearest echo candidate within its gate (or starts one). A candidate is a running
 * mean position and an exponentially smoothed hit rate per scan; it becomes a fixed echo once it
 * has been hit in most scans for `afterS`. A target that has moved keeps its detections (the
 * tracker offers them to moving tracks first), so a positioner pausing for tens of seconds is not
 * learned into the map; a reflector that never moved is.
 */
import type { Detection, FixedEcho, Measurement } from '../types.ts';
import { EchotrailError } from '../errors.ts';
import { mahalanobis2 } from './filter-types.ts';
import { SpatialGrid } from './spatial-grid.ts';

export interface FixedEchoOptions {
  /** Learn fixed echoes and keep them out of the tracks. */
  enabled: boolean;
  /** Hits in most scans for this long make a fixed echo, s; 0 = 10 s or 8 scans, whichever is longer. */
  afterS: number;
  /** Displacement from where a track started above which it counts as a moving target, m. */
  moveThresholdM: number;
  /** An echo not seen for this long is forgotten, s. */
  forgetS: number;
}

export function resolveFixedEchoOptions(o: Partial<FixedEchoOptions> = {}): FixedEchoOptions {
  const r = { enabled: o.enabled ?? true, afterS: o.afterS ?? 0, moveThresholdM: o.moveThresholdM ?? 0.15, forgetS: o.forgetS ?? 60 };
  if (!(r.afterS >= 0) || !(r.moveThresholdM > 0) || !(r.forgetS > 0)) {
    throw new EchotrailError('E_OPTION', 'fixed-echo times (s) and move threshold (m) must be positive');
  }
  return r;
}

/** Result of one look-up: nearest candidate of any kind, nearest active fixed echo. */
export interface EchoLookup {
  any: EchoCandidate | null;
  fixed: EchoCandidate | null;
}

/** A reflector the map is learning or has learned (opaque outside this module). */
export interface EchoCandidate {
  id: number;
  x: number;
  y: number;
  n: number;
  ampSum: number;
  /** Smoothed share of scans with a hit, from detections no moving track took. */
  rate: number;
  /** The same from every detection, whoever took it (for persistentAt). */
  rateAll: number;
  lastScanAll: number;
  lastScan: number;
  /** First detection, s. */
  firstS: number;
  /** Start of the current persistent stretch, s. */
  sinceS: number;
  lastSeenS: number;
  /** Times of the last few learned detections, s (a ring of RECENT_SEEN, NaN while empty). */
  recentS: number[];
  /** Next slot of recentS. */
  recentAt: number;
  scansSeen: number;
  fixed: boolean;
}

/** Smoothing of the per-scan hit rate (an 8-scan memory, roughly). */
const A = 0.125;

export class FixedEchoMap {
  private readonly cands = new Map<number, EchoCandidate>();
  private readonly grid = new SpatialGrid<EchoCandidate>(1);
  private nextId = 1;
  private fixedCount = 0;

  /**
   * @param gamma gate threshold (χ², 2 dof)
   * @param scanS one scan: revolution period, or the staring update interval
   * @param afterS persistence needed to become an echo, s
   * @param staring `seen` counts seconds instead of scans
   */
  constructor(
    private readonly gamma: number,
    private readonly scanS: number,
    private readonly afterS: number,
    private readonly staring: boolean,
  ) {}

  /**
   * An echo unseen for this long is "vacated": it no longer blanks detections. That is what a
   * target parked at the start of a run leaves behind once it drives off; when it comes back to
   * park there its detections go to its moving track, so the vacated echo never wakes up again.
   */
  private vacateS(): number {
    return Math.max(8 * this.scanS, 8);
  }

  private nearest(m: Measurement, activeFixedOnly: boolean): EchoCandidate | null {
    const r = this.search(m);
    return activeFixedOnly ? r.fixed : r.any;
  }

  /** Nearest candidate within its gate, and nearest active fixed echo, in one pass. */
  private search(m: Measurement): EchoLookup {
    let any: EchoCandidate | null = null;
    let fixed: EchoCandidate | null = null;
    let bAny = this.gamma;
    let bFixed = this.gamma;
    // Cheap Euclidean pre-check: no gate here is wider than 4 times the larger measurement σ.
    const r2 = 16 * (m.rxx + m.ryy);
    const vacate = this.vacateS();
    for (const c of this.grid.queryAround(m.x, m.y, Math.sqrt(r2))) {
      const ex = m.x - c.x;
      const ey = m.y - c.y;
      if (ex * ex + ey * ey > r2) continue;
      // Gate on R·(1 + 1/n): the detection's own noise plus that of the candidate's mean.
      const k = 1 + 1 / c.n;
      const d2 = mahalanobis2(ex, ey, k * m.rxx + 1e-4, k * m.rxy, k * m.ryy + 1e-4);
      if (d2 < bAny) {
        bAny = d2;
        any = c;
      }
      if (c.fixed && d2 < bFixed && m.timeS - c.lastSeenS <= vacate) {
        bFixed = d2;
        fixed = c;
      }
    }
    return { any, fixed };
  }

  /**
   * Cost d² + ln|S| of explaining the measurement by the nearest fixed echo, or Infinity when no
   * echo gates it. On the same scale as the assignment cost, so the tracker can let the echo keep
   * a detection that it explains better than a moving track does.
   */
  match(m: Measurement): number {
    return this.costOf(this.search(m), m);
  }

  /**
   * The candidate nearest to `m` within its gate, fixed or not, or null. The tracker looks up
   * each detection once and hands the answer to costOf, persistent, learnWith and observeWith.
   */
  lookup(m: Measurement): EchoLookup {
    return this.search(m);
  }

  /** match() for a looked-up measurement: Infinity unless an active fixed echo gates it. */
  costOf(l: EchoLookup, m: Measurement): number {
    const c = l.fixed;
    if (!c) return Infinity;
    const k = 1 + 1 / c.n;
    const sxx = k * m.rxx + 1e-4;
    const sxy = k * m.rxy;
    const syy = k * m.ryy + 1e-4;
    return mahalanobis2(m.x - c.x, m.y - c.y, sxx, sxy, syy) + Math.log(sxx * syy - sxy * sxy);
  }

  /**
   * True when the measurement falls on a reflector that has been there scan after scan (fixed or
   * about to be). A track standing on such a spot is not evidence of motion: the tracker uses
   * this so that a track hopping between wall reflectors is not taken for a moving target.
   */
  persistentAt(m: Measurement): { id: number; ageS: number } | null {
    return this.persistent(this.search(m).any, m);
  }

  /** persistentAt() for a looked-up candidate. */
  persistent(c: EchoCandidate | null, m: Measurement): { id: number; ageS: number } | null {
    if (!c) return null;
    const scan = Math.floor(m.timeS / this.scanS);
    const live = c.fixed ? m.timeS - c.lastSeenS <= this.vacateS() || c.rateAll * (1 - A) ** Math.max(0, scan - c.lastScanAll - 1) >= 0.3 : c.rateAll * (1 - A) ** Math.max(0, scan - c.lastScanAll - 1) >= 0.3;
    return live && m.timeS - c.firstS >= this.settleS() ? { id: c.id, ageS: m.timeS - c.firstS } : null;
  }

  /**
   * Notes a detection that a moving track took: it keeps the spot's persistence up to date (so a
   * track sitting on a reflector can be recognised) without teaching the map a fixed echo there.
   */
  observe(m: Measurement): void {
    this.observeWith(this.search(m).any, m);
  }

  observeWith(c: EchoCandidate | null, m: Measurement): void {
    if (c) this.bumpAll(c, Math.floor(m.timeS / this.scanS));
  }

  /**
   * True when a spot a track has left still answers: one of the track's earlier hits (`hits`,
   * oldest first, the latest last; those of the last `withinS` count) or the hit where its
   * departure began (`from`, whatever its age) lies on a reflector of the map that has since given
   * two detections the track did not take, at least `gapS` after that hit, and that reflector is not
   * where the track is now (`now`). A target that drives on leaves its spots silent behind it; a
   * track hopping from one reflector of a wall to the next leaves reflectors that keep answering.
   * Only detections the map learned count (no moving track took them). (The age limit: a track that coasted over from elsewhere, say a mount track that lost its
   * mount and picked up a target, is judged on where it has been lately.) `nowLookup` is
   * lookup(now) when the caller already has it (the map must not have changed since).
   */
  leftBehindAnswers(hits: readonly Measurement[], from: Measurement | undefined, now: Measurement, gapS: number, withinS: number, nowLookup?: EchoLookup): boolean {
    const here = (nowLookup ?? this.search(now)).any;
    const answers = (h: Measurement, k: number): boolean => {
      const c = this.search(h).any;
      if (!c || c === here || c.lastSeenS < h.timeS + gapS) return false;
      // Twice since the hit, not counting the track's own later hits (they land on its old spots
      // when it moves slowly): one stray answer may be the same target taken by a duplicate track.
      let foreign = 0;
      for (const t of c.recentS) {
        if (!(t >= h.timeS + gapS)) continue;
        let own = false;
        for (let i = k + 1; i < hits.length; i++) if (hits[i].timeS === t) own = true;
        if (!own) foreign++;
      }
      return foreign >= 2;
    };
    for (let k = 0; k < hits.length - 1; k++) if (now.timeS - hits[k].timeS <= withinS && answers(hits[k], k)) return true;
    if (from && from !== hits[hits.length - 1]) {
      let k = hits.indexOf(from);
      if (k < 0) k = -1;
      if (answers(from, k)) return true;
    }
    return false;
  }

  private bumpAll(c: EchoCandidate, scan: number): void {
    if (scan > c.lastScanAll) {
      c.rateAll = c.rateAll * (1 - A) ** (scan - c.lastScanAll) + A;
      c.lastScanAll = scan;
    }
  }

  /** How long a candidate must have been answering before it counts as persistent, s. */
  settleS(): number {
    return Math.max(3 * this.scanS, 2);
  }

  /** Learns from a detection no moving track took; true when it belongs to a fixed echo. */
  learn(m: Measurement, d: Detection): boolean {
    return this.learnWith(this.search(m).any, m, d);
  }

  /** learn() for a looked-up candidate (null: start one). */
  learnWith(found: EchoCandidate | null, m: Measurement, d: Detection): boolean {
    const scan = Math.floor(m.timeS / this.scanS);
    let c = found && this.cands.get(found.id) === found ? found : null;
    if (!c) {
      c = { id: this.nextId++, x: m.x, y: m.y, n: 0, ampSum: 0, rate: 0, rateAll: 0, lastScanAll: scan - 1, lastScan: scan - 1, firstS: m.timeS, sinceS: m.timeS, lastSeenS: m.timeS, recentS: [NaN, NaN, NaN, NaN], recentAt: 0, scansSeen: 0, fixed: false };
      this.cands.set(c.id, c);
      this.grid.set(c, m.x, m.y, 0);
    }
    c.n++;
    c.x += (m.x - c.x) / c.n;
    c.y += (m.y - c.y) / c.n;
    c.ampSum += d.amplitude;
    c.lastSeenS = m.timeS;
    c.recentS[c.recentAt] = m.timeS;
    c.recentAt = (c.recentAt + 1) % c.recentS.length;
    this.bumpAll(c, scan);
    if (scan > c.lastScan) {
      c.rate = c.rate * (1 - A) ** (scan - c.lastScan) + A;
      c.lastScan = scan;
      c.scansSeen++;
      // The mean rate of a fresh candidate is judged once it had time to build up.
      if (c.rate < 0.3 && m.timeS - c.sinceS > 8 * this.scanS) c.sinceS = m.timeS;
    }
    if (!c.fixed && c.rate >= 0.5 && m.timeS - c.sinceS >= this.afterS) {
      c.fixed = true;
      this.fixedCount++;
    }
    return c.fixed;
  }

  /** Drops candidates that faded (clutter) and echoes not seen for `forgetS`; keeps memory bounded. */
  expire(nowS: number, forgetS: number): void {
    const scan = Math.floor(nowS / this.scanS);
    for (const c of this.cands.values()) {
      const rate = c.rateAll * (1 - A) ** (scan - c.lastScanAll);
      if ((c.fixed && nowS - c.lastSeenS > forgetS) || (!c.fixed && rate < 0.05)) {
        this.cands.delete(c.id);
        this.grid.remove(c);
        if (c.fixed) this.fixedCount--;
      }
    }
  }

  list(): FixedEcho[] {
    const out: FixedEcho[] = [];
    for (const c of this.cands.values()) {
      if (!c.fixed) continue;
      let az = Math.atan2(c.x, c.y);
      if (az < 0) az += 2 * Math.PI;
      const seen = this.staring ? c.lastSeenS - c.sinceS : c.scansSeen;
      out.push({ x: c.x, y: c.y, rangeM: Math.hypot(c.x, c.y), azimuthRad: az, seen, amplitude: c.ampSum / c.n });
    }
    return out;
  }

  /** Fixed echoes in the map. */
  get size(): number {
    return this.fixedCount;
  }

  /** Candidates held (fixed or not), for memory checks. */
  get candidates(): number {
    return this.cands.size;
  }
}
