/**
 * One track's life: hits and misses, M-of-N confirmation, coasting, the deletion rules, the
 * quality figure and the "has it ever moved" test that separates targets from fixed echoes.
 */
import type { Detection, Measurement, TrackStatus, TrackUpdate } from '../types.ts';
import { EchotrailError } from '../errors.ts';
import { lambdaMax, mahalanobis2, type TrackFilter } from './filter-types.ts';
import { MofN } from './m-of-n.ts';

export interface DeletionOptions {
  /** Consecutive missed scans after which a confirmed track is deleted. */
  maxMisses: number;
  /** ...but never before it has coasted this long, s (matters for staring antennas at hundreds of Hz). */
  minCoastS: number;
  /** Delete when the position standard deviation (largest axis) exceeds this plus twice the measurement σ there, m. */
  maxPositionSigmaM: number;
}

export function resolveDeletionOptions(o: Partial<DeletionOptions> = {}): DeletionOptions {
  const r = { maxMisses: o.maxMisses ?? 3, minCoastS: o.minCoastS ?? 1, maxPositionSigmaM: o.maxPositionSigmaM ?? 1.5 };
  if (!Number.isInteger(r.maxMisses) || r.maxMisses < 1 || !(r.minCoastS >= 0) || !(r.maxPositionSigmaM > 0)) {
    throw new EchotrailError('E_OPTION', 'deletion needs max misses ≥ 1 (integer), min coast ≥ 0 s, max position σ > 0 m');
  }
  return r;
}


/**
 * Two detections of one stationary reflector differ by noise of covariance R₁ + R₂: beyond its
 * 99 % χ² bound (9.2103 for 2 dof; NIST/SEMATECH e-Handbook of Statistical Methods, χ² table) and by more than `minM`, they are taken
 * to be of two spots. (99 %, not 99.9 %: a target at 0.2 m/s must pass within a few scans.)
 */
function departed(a: Measurement, b: Measurement, minM: number): boolean {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  return dx * dx + dy * dy > minM * minM && mahalanobis2(dx, dy, a.rxx + b.rxx, a.rxy + b.rxy, a.ryy + b.ryy) > 9.2103;
}

/** Earlier hits a track keeps for the left-behind test: the start of a three-hit departure. */
export const RECENT_HITS = 5;

/** Weight of each new hit in Track.recentAmplitude: about the last three hits count. */
const RECENT_AMPLITUDE_WEIGHT = 1 / 3;

export class Track {
  status: TrackStatus = 'tentative';
  hits = 1;
  misses = 0;
  lastHitS: number;
  confirmedS = NaN;
  /** 0..1, see onHit/onMiss. */
  quality = 0.3;
  /** Sticky: set once the track has left its starting point (unless demoted). */
  moved = false;
  /** When `moved` was last set, s. */
  movedS = NaN;
  /** Consecutive hits on persistent reflectors that were there before the track (see Tracker). */
  echoHits = 0;
  /** Where and since when the track has been within moveThreshold of one spot. */
  private stayX = NaN;
  private stayY = NaN;
  private stayS = NaN;
  lastNis: number | undefined;
  /** Largest eigenvalue of the last detection's covariance, m². */
  lastRMax = 0;
  lastMeasurement: Measurement | undefined;
  /** The latest hits, oldest first (at most RECENT_HITS), kept through coasts, for the left-behind test. */
  readonly recent: Measurement[] = [];
  /** Until when its disc in the tracker's gate index holds its gate, s (see gate-index.ts). */
  reachUntilS = -Infinity;
  private readonly mofn: MofN;
  private ax: number;
  private ay: number;
  private an = 1;
  private outside = 0;
  /** The anchor was last set on a reflector away from where the track started (see onHit). */
  private slidIn = false;
  /** The track's first detection. */
  private readonly birth: Measurement;
  /** First hit of the current run of hits away from the anchor. */
  private outsideFrom: Measurement | undefined;
  private ampSum: number;
  /**
   * The amplitude of the latest hits, smoothed (weight RECENT_AMPLITUDE_WEIGHT on each new hit).
   * It follows the echo as the range changes (the voltage amplitude goes as 1/R², radar equation),
   * which the run's mean amplitude does not: a carriage driving from 1.5 m to 4 m fades to a seventh.
   */
  recentAmplitude: number;

  constructor(
    readonly id: number,
    readonly filter: TrackFilter,
    m: Measurement,
    d: Detection,
    mofn: { m: number; n: number },
    readonly createdS = m.timeS,
  ) {
    this.lastHitS = m.timeS;
    this.recent.push(m);
    this.birth = m;
    this.mofn = new MofN(mofn.m, mofn.n);
    this.ax = m.x;
    this.ay = m.y;
    this.ampSum = d.amplitude;
    this.recentAmplitude = d.amplitude;
    this.lastMeasurement = m;
    this.lastRMax = lambdaMax(m.rxx, m.rxy, m.ryy);
    if (mofn.m <= 1) this.confirm(m.timeS);
  }

  private confirm(t: number): void {
    this.status = 'confirmed';
    this.confirmedS = t;
  }

  get amplitude(): number {
    return this.ampSum / this.hits;
  }

  /**
   * After the filter took `m`. `moveThresholdM` decides when the track has left its start;
   * `onReflector` says the detection sits on a persistent stationary reflector; no track counts
   * as moving before it is `settleS` old, the time the map needs to know the reflectors.
   */
  onHit(m: Measurement, nis: number, d: Detection, moveThresholdM: number, onReflector = false, settleS = 0, leftBehind = false): void {
    this.recent.push(m);
    if (this.recent.length > RECENT_HITS) this.recent.shift();
    this.hits++;
    this.misses = 0;
    this.lastHitS = m.timeS;
    this.lastNis = nis;
    this.lastRMax = lambdaMax(m.rxx, m.rxy, m.ryy);
    this.lastMeasurement = m;
    this.ampSum += d.amplitude;
    this.recentAmplitude += RECENT_AMPLITUDE_WEIGHT * (d.amplitude - this.recentAmplitude);
    this.noteStay(m, Math.max(2 * moveThresholdM, 3 * Math.sqrt(m.rxx + m.ryy)));
    // Consistent innovations (NIS near its mean of 2) raise quality more than surprising ones.
    const g = Math.exp(-Math.max(0, nis - 2) / 4);
    this.quality += (1 - this.quality) * 0.3 * g;
    if (this.status !== 'confirmed') {
      this.mofn.record(true);
      if (this.status === 'coasting' || this.mofn.confirmed()) {
        if (Number.isNaN(this.confirmedS)) this.confirm(m.timeS);
        else this.status = 'confirmed';
      }
    }
    if (!this.moved) {
      // Anchor = running mean of the detections while parked, so its noise is R/n. The track has
      // left it when the filtered position differs from it beyond the 99.9 % χ² bound of
      // P + R/n (13.8155 for 2 dof) and by more than moveThresholdM.
      const e = this.filter.estimate();
      const dx = e.x - this.ax;
      const dy = e.y - this.ay;
      const k = 1 / this.an;
      const d2 = mahalanobis2(dx, dy, e.pxx + k * m.rxx, e.pxy + k * m.rxy, e.pyy + k * m.ryy);
      // Three hits in a row away from the anchor: one stray detection (a neighbouring wall
      // reflector, a clutter hit inside the gate) must not make a fixed reflector a target.
      // A hit on a spot where a stationary reflector has answered for several scans is not
      // counted either way: that is how a track hopping along a wall looks.
      if (onReflector) {
        // Neither evidence of motion nor of rest; but the track is here now, so a departure is
        // measured from here: a track that slid along a wall to its end must not count the
        // distance from where it started as motion.
        this.outside = 0;
        this.an = 1;
        this.ax = m.x;
        this.ay = m.y;
        // Slid in: the reflector is not where the track started (a parked target's own spot is).
        this.slidIn = departed(this.birth, m, moveThresholdM);
      } else if (this.status !== 'tentative' && d2 > 13.8155 && dx * dx + dy * dy > moveThresholdM * moveThresholdM) {
        // ...and not while a spot it came from still answers (see FixedEchoMap.leftBehindAnswers;
        // the first hit of this run away from the anchor is one of those spots). A track that
        // came here over reflectors has a one-detection anchor and the velocity of its slide,
        // which carries its estimate past that anchor: its run must also leave its own first
        // spot (a track that slid along a wall to its end and sits there does not).
        if (this.outside++ === 0) this.outsideFrom = m;
        if (this.outside >= 3 && m.timeS - this.createdS >= settleS && !leftBehind && (!this.slidIn || departed(this.outsideFrom!, m, moveThresholdM))) {
          this.moved = true;
          this.movedS = m.timeS;
        }
      } else {
        this.outside = 0;
        this.an++;
        this.ax += (m.x - this.ax) / this.an;
        this.ay += (m.y - this.ay) / this.an;
      }
    }
  }

  /**
   * Time the track arrived where `m` is (its first hit within moveThresholdM of the current
   * spot, approximately): a reflector older than the stay was there before the track.
   */
  lastArrivalS(m: Measurement): number {
    return Number.isNaN(this.stayS) ? m.timeS : this.stayS;
  }

  /** First hit of the current run away from the anchor (where a departure began), if any. */
  departureStart(): Measurement | undefined {
    return this.outside > 0 ? this.outsideFrom : undefined;
  }

  /** Takes the moving status away and re-anchors here (see Tracker: tracks that wander onto reflectors). */
  demote(m: Measurement): void {
    this.moved = false;
    this.outside = 0;
    this.ax = m.x;
    this.ay = m.y;
    this.an = 1;
    this.echoHits = 0;
  }

  private stayN = 0;

  /** The stay point is the running mean of its detections, so noise does not end a stay. */
  private noteStay(m: Measurement, thr: number): void {
    if (Number.isNaN(this.stayS) || Math.hypot(m.x - this.stayX, m.y - this.stayY) > thr) {
      this.stayX = m.x;
      this.stayY = m.y;
      this.stayS = m.timeS;
      this.stayN = 1;
    } else {
      this.stayN++;
      this.stayX += (m.x - this.stayX) / this.stayN;
      this.stayY += (m.y - this.stayY) / this.stayN;
    }
  }

  /** A scan passed without a detection. */
  onMiss(): void {
    this.misses++;
    this.lastNis = undefined;
    this.lastMeasurement = undefined;
    this.quality *= 0.7;
    if (this.status === 'tentative') this.mofn.record(false);
    else this.status = 'coasting';
  }

  /** Tentative track that can no longer reach M of N. */
  failedInitiation(): boolean {
    return this.status === 'tentative' && this.mofn.failed();
  }

  /** Delete reason for an established track, or null. */
  deletionReason(nowS: number, o: DeletionOptions): 'misses' | 'covariance' | null {
    if (this.status === 'tentative') return null;
    const e = this.filter.estimate();
    // Relative to the measurement noise where the track is: at 30 m a 1.5° encoder alone gives
    // 0.8 m across the beam, and one coast must not delete a track there.
    const limit = o.maxPositionSigmaM + 2 * Math.sqrt(this.lastRMax);
    if (Math.sqrt(lambdaMax(e.pxx, e.pxy, e.pyy)) > limit) return 'covariance';
    if (this.misses >= o.maxMisses && nowS - this.lastHitS >= o.minCoastS) return 'misses';
    return null;
  }

  update(withMeasurement: boolean): TrackUpdate {
    const e = this.filter.estimate();
    const speed = Math.hypot(e.vx, e.vy);
    let heading = Math.atan2(e.vx, e.vy);
    if (heading < 0) heading += 2 * Math.PI;
    const u: TrackUpdate = {
      timeS: this.filter.timeS,
      id: this.id,
      status: this.status,
      x: e.x,
      y: e.y,
      vx: e.vx,
      vy: e.vy,
      speed,
      headingRad: heading,
      pxx: e.pxx,
      pxy: e.pxy,
      pyy: e.pyy,
      quality: this.quality,
      moving: this.moved,
      hits: this.hits,
      misses: this.misses,
      startS: this.createdS,
    };
    if (withMeasurement && this.lastMeasurement) {
      u.measurement = this.lastMeasurement;
      u.nis = this.lastNis;
    }
    return u;
  }
}
