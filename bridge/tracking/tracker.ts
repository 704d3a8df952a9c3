/**
 * The tracker: composes conversion, gating, assignment, filters, track life and the fixed-echo
 * map behind the TrackEngine contract (bridge/types.ts).
 *
 * Flow: detections are held for a short warm-up (antenna kind, interval, noise are inferred from
 * them), then assigned one by one as they come (rotating antenna, live; a cluster of tracks and
 * detections whose gates the beam has not yet swept past waits for it, see sweep-deferral.ts)
 * or in batches of `batchS` (staring: half the update interval; rotating with
 * `revolutionBatches`, files: half a revolution). Each batch is gated against the tracks whose
 * gate discs hold each detection (gate-index.ts), solved by global nearest neighbour
 * (assignment.ts), and leftovers become seeds (or pair with an earlier seed into a tentative
 * track) unless a fixed echo or a confirmed track already claims them. Misses are counted
 * against each track's expected next detection (one interval after its last hit).
 *
 * The filter, gate, associator, initiator and deleter are parts (tracker-parts.ts): the defaults
 * named above, or others given to the constructor.
 */
import type { Detection, FixedEcho, Measurement, TrackDeletion, TrackEngine, TrackerOutput, TrackUpdate } from '../types.ts';
import { FixedEchoMap } from './fixed-echo-map.ts';
import { gateThreshold } from './gate.ts';
import { antennaSettled, decide, decideNoise, describeInference, describeNoise, type TrackerInference } from './inference.ts';
import { noiseAtRange, toMeasurement, type MeasurementOptions } from './measurement.ts';
import { ReleaseQueue } from './release-queue.ts';
import { heldBack } from './sweep-deferral.ts';
import { GateIndex } from './gate-index.ts';
import { RECENT_HITS, Track } from './track-life.ts';
import { resolveTrackerOptions, type TrackerOptions, type TrackerOptionsInput } from './tracker-options.ts';
import { resolveTrackerParts, type Initiator, type TrackerParts } from './tracker-parts.ts';

export { resolveTrackerOptions, describeInference, describeNoise };
export type { TrackerOptions, TrackerOptionsInput, TrackerInference, TrackerParts };

/**
 * On a rotating antenna one target gives one detection per revolution, so a track takes no
 * detection less than half a revolution after its last hit: a second detection within the same
 * sweep belongs to a neighbour, and taking it is how a track chains along a wall of reflectors.
 * Half a revolution leaves room for a target that moves against or with the beam.
 */
const MIN_GAP_REVOLUTIONS = 0.5;

/**
 * Longest a detection waits for the rest of its cluster, in revolutions. A coasting track's gate
 * can span the whole room; half a revolution lets the beam reach whatever may compete for it
 * (tracks with held detections are not counted as missing meanwhile).
 */
const MAX_WAIT_REVOLUTIONS = 0.5;

export class Tracker implements TrackEngine {
  readonly options: TrackerOptions;
  /** Filter, gate, associator, initiator and deleter (tracker-parts.ts). */
  private readonly parts: TrackerParts;
  private readonly gamma: number;
  private warm: Detection[] | null = [];
  private info: TrackerInference | null = null;
  private meas!: MeasurementOptions;
  private echoes!: FixedEchoMap;
  private seeds!: Initiator;
  /** Tracks by where their gates reach (set up once the interval is known). */
  private index!: GateIndex<Track>;
  private readonly live = new Map<number, Track>();
  private nextId = 1;
  private batch: Detection[] = [];
  private batchStart = 0;
  private lastTime = -Infinity;
  private lastMissCheck = -Infinity;
  private lastExpire = -Infinity;
  private outOfOrder = 0;
  private readonly needsWarmup: boolean;
  /** Azimuth wraps seen during the warm-up, and at the last settling check. */
  private wraps = 0;
  private wrapsChecked = 0;
  private flushing = false;
  /** Detections still being collected after the warm-up for lateDecisions (null: none). */
  private noiseBuf: Detection[] | null = null;
  /** Tracks with detections held back (see sweep-deferral.ts) → when their cluster is released, s. */
  private readonly waiting = new Map<number, number>();
  /** Detections held back until their release times. */
  private readonly pool = new ReleaseQueue();
  /** How often each detection now in the pool has been held (see sweep-deferral.ts, REHOLD_LIMIT). */
  private readonly timesHeld = new Map<Detection, number>();
  /** Shortest time between two hits of one track, s (see MIN_GAP_REVOLUTIONS). */
  private minGapS = 0;

  /** @param parts parts to use instead of the defaults (tracker-parts.ts) */
  constructor(options: TrackerOptionsInput | TrackerOptions = {}, parts: Partial<TrackerParts> = {}) {
    this.options = resolveTrackerOptions(options as TrackerOptionsInput);
    this.parts = resolveTrackerParts(parts);
    this.gamma = gateThreshold(this.options.gate.probability, 2);
    const o = this.options;
    // The antenna must be inferred before tracking can start; the noise estimate need not hold
    // tracking up: it goes on collecting and applies when done (see collectNoise).
    this.needsWarmup = o.antenna === 'auto' || !(o.intervalS > 0);
    if (!this.needsWarmup) this.start();
  }

  /** What was inferred (or taken from options) at the start of the run; null before the warm-up ends. */
  inferred(): TrackerInference | null {
    return this.info ? { ...this.info, outOfOrder: this.outOfOrder } : null;
  }

  push(d: Detection): TrackerOutput {
    const out: TrackerOutput = { updates: [], deletions: [] };
    if (!(d.timeS >= this.lastTime)) {
      this.outOfOrder++;
      return out;
    }
    this.lastTime = d.timeS;
    if (this.warm) {
      const w = this.warm;
      if (w.length && d.azimuthRad - w[w.length - 1].azimuthRad < -Math.PI) this.wraps++;
      w.push(d);
      if (this.warmupOver(d)) this.start(out);
      return out;
    }
    if (this.noiseBuf) this.collectNoise(d);
    this.step(d, out);
    return out;
  }

  /**
   * The warm-up ends once the antenna is settled (antennaSettled: a few revolutions, or a few
   * seconds of a staring antenna), at the latest after warmupS or warmupDetections. Settling is
   * checked at each azimuth wrap, or every 256 detections while there is none.
   */
  private warmupOver(d: Detection): boolean {
    const o = this.options;
    const w = this.warm!;
    if (w.length >= o.warmupDetections || d.timeS - w[0].timeS >= o.warmupS) return true;
    const wrapped = this.wraps !== this.wrapsChecked;
    if (!wrapped && w.length % 256 !== 0) return false;
    this.wrapsChecked = this.wraps;
    if (this.wraps > 0 && this.wraps < o.warmupRevolutions + 1) return false;
    return antennaSettled(w, o.warmupRevolutions, o.warmupRevolutions);
  }

  /** Collects detections until the full warm-up horizon, then makes the late decisions. */
  private collectNoise(d: Detection): void {
    const buf = this.noiseBuf!;
    buf.push(d);
    const o = this.options;
    if (buf.length < o.warmupDetections && d.timeS - buf[0].timeS < o.warmupS) return;
    this.noiseBuf = null;
    this.lateDecisions(buf);
  }

  /**
   * The decisions that a longer stretch of the run makes better: the noise estimate (when still
   * pending) and the inferred interval, refined from more revolutions than the warm-up needed.
   */
  private lateDecisions(buf: readonly Detection[]): void {
    const o = this.options;
    const info = this.info!;
    if (info.noisePending) decideNoise(info, buf, o);
    const before = this.meas;
    this.meas = { ...o.measurement, sigmaRangeM: info.sigmaRangeM, sigmaAzimuthRad: info.sigmaAzimuthRad };
    // The gate discs were drawn for the old noise: a larger one needs them all redrawn now.
    if (this.meas.sigmaRangeM > before.sigmaRangeM || this.meas.sigmaAzimuthRad > before.sigmaAzimuthRad) {
      for (const t of this.live.values()) this.index.place(t, Math.max(t.reachUntilS, t.filter.timeS + this.info!.intervalS));
    }
    if (info.intervalFrom === 'inferred') {
      const later = decide(buf, o, true);
      if (later.antenna === info.antenna && later.intervalFrom === 'inferred') info.intervalS = later.intervalS;
    }
  }

  flush(): TrackerOutput {
    const out: TrackerOutput = { updates: [], deletions: [] };
    if (this.warm) {
      this.flushing = true;
      this.start(out);
      this.flushing = false;
    }
    if (this.noiseBuf && this.noiseBuf.length) {
      // End of the stream before the horizon: decide from what there is.
      const buf = this.noiseBuf;
      this.noiseBuf = null;
      this.lateDecisions(buf);
    }
    const rest = [...this.pool.drain(), ...this.batch].sort((a, b) => a.timeS - b.timeS);
    this.timesHeld.clear();
    this.batch = [];
    this.waiting.clear();
    if (rest.length) this.closeBatch(out, rest, true);
    return out;
  }

  tracks(): TrackUpdate[] {
    return [...this.live.values()].map((t) => t.update(true));
  }

  fixedEchoes(): FixedEcho[] {
    return this.echoes ? this.echoes.list() : [];
  }

  /** Ends the warm-up: decide, then run the buffered detections. */
  private start(out?: TrackerOutput): void {
    const buf = this.warm ?? [];
    this.warm = null;
    const o = this.options;
    // Noise from what the warm-up saw if it ran its full length; else later, from more.
    const full = buf.length >= o.warmupDetections || (buf.length > 0 && buf[buf.length - 1].timeS - buf[0].timeS >= o.warmupS);
    this.info = decide(buf, o, o.estimateNoise && !full && !this.flushing);
    if (!full && !this.flushing && (this.info.noisePending || this.info.intervalFrom === 'inferred')) this.noiseBuf = [...buf];
    this.meas = { ...this.options.measurement, sigmaRangeM: this.info.sigmaRangeM, sigmaAzimuthRad: this.info.sigmaAzimuthRad };
    // 4 m cells: the default IMM's manoeuvre model gives gates of 1.5–3 m radius at a 1 s
    // revolution, so a track covers a few cells, and rewriting them as it moves stays cheap
    // (2 m cells were slower on the benchmark: more cells to rewrite than candidates saved).
    this.index = new GateIndex(4, this.gamma, this.info.intervalS, o.initiation.maxSpeedMps, (r) => noiseAtRange(r, this.meas));
    this.echoes = new FixedEchoMap(this.gamma, this.info.intervalS, this.echoAfterS(), this.info.antenna === 'staring');
    this.minGapS = this.info.antenna === 'rotating' ? MIN_GAP_REVOLUTIONS * this.info.intervalS : 0;
    // A seed lives 2.5 intervals: it may wait out one missed scan, as a one-hit tentative track
    // would under M-of-N.
    this.seeds = this.parts.createInitiator(this.options.initiation.maxSpeedMps, 2.5 * this.info.intervalS, this.minGapS);
    const sink = out ?? { updates: [], deletions: [] };
    for (const d of buf) this.step(d, sink);
  }

  private step(d: Detection, out: TrackerOutput): void {
    if (this.info!.batchS === 0) {
      // Every detection at once, with the held ones whose time has come (see closeBatch).
      const now = d.timeS;
      const due: Detection[] = [];
      if (now >= this.pool.next) this.pool.takeDue(now, due);
      due.push(d);
      this.closeBatch(out, due, false);
      return;
    }
    if (this.batch.length && d.timeS - this.batchStart > this.info!.batchS) {
      // Held detections whose time has come go first (they are older than the window's).
      const dets: Detection[] = [];
      if (d.timeS >= this.pool.next) this.pool.takeDue(d.timeS, dets);
      for (const x of this.batch) dets.push(x);
      this.batch = [];
      this.closeBatch(out, dets, false);
    }
    if (this.batch.length === 0) this.batchStart = d.timeS;
    this.batch.push(d);
  }

  /**
   * Assigns a batch. Unless `final`, when each detection is assigned as it comes (rotating
   * antenna, no batch window), the contested clusters whose gates the beam has not swept past yet
   * are held in the pool until it has (see sweep-deferral.ts). Batches are not held: a held
   * detection joined a later batch with the next detection of the same target, only one of which
   * the track could take, and the other started a second track (measured on the demo scenarios:
   * twice the track ids, four times the off-target rows).
   */
  private closeBatch(out: TrackerOutput, dets: Detection[], final = true): void {
    const o = this.options;
    const gamma = this.gamma;
    const ms: Measurement[] = dets.map((d) => toMeasurement(d, this.meas));
    // Established tracks (confirmed, coasting) pick first, tentative ones share what is left:
    // a wide tentative gate must never take a detection from an established track, and keeping
    // them apart keeps the clusters of the first pass small.
    const learn = o.fixedEchoes.enabled;
    let latest = -Infinity;
    for (const m of ms) if (m.timeS > latest) latest = m.timeS;
    this.index.refresh(latest, this.live);
    const gates = this.parts.gate(ms, this.index, learn ? this.echoes : null, gamma, this.minGapS, o.initiation.maxSpeedMps, dets);
    let { established, tentative } = gates;
    const { missCost, echo: cand, nearEstablished: nearConfirmed } = gates;
    const now = dets[dets.length - 1].timeS;
    const interval = this.info!.intervalS;
    let held: Float64Array | null = null;
    if (!final && this.info!.batchS === 0 && this.info!.antenna === 'rotating' && (established.length || tentative.length)) {
      const last = ms[ms.length - 1];
      const times = ms.map((m) => m.timeS);
      const all = established.length && tentative.length ? established.concat(tentative) : established.length ? established : tentative;
      const counts = dets.map((d) => this.timesHeld.get(d) ?? 0);
      const h = heldBack(all, times, this.live, this.waiting, now, Math.atan2(last.x, last.y), gamma, interval, MAX_WAIT_REVOLUTIONS * interval, counts);
      let any = false;
      for (let j = 0; j < h.length; j++) {
        if (Number.isNaN(h[j])) continue;
        any = true;
        this.timesHeld.set(dets[j], counts[j] + 1);
        this.pool.push(dets[j], h[j]);
      }
      if (any) {
        held = h;
        for (const p of all) if (!Number.isNaN(h[p.det])) this.waiting.set(p.track, Math.max(this.waiting.get(p.track) ?? -Infinity, h[p.det]));
        established = established.filter((p) => Number.isNaN(h[p.det]));
        tentative = tentative.filter((p) => Number.isNaN(h[p.det]));
      }
    }
    // Detections decided now leave the hold counts, whatever path brought them here (a released
    // detection whose tracks are gone has no pairs and never reaches heldBack).
    if (this.timesHeld.size) for (let j = 0; j < dets.length; j++) if (!held || Number.isNaN(held[j])) this.timesHeld.delete(dets[j]);
    const taken = new Uint8Array(ms.length); // 1 = by a track that had not moved, 2 = by a moving track
    const hitNow = new Set<number>();
    const miss = (id: number) => missCost.get(id)!;
    const chosen = this.parts.associate(established, miss);
    for (const [, j] of chosen) taken[j] = 1;
    chosen.push(...this.parts.associate(tentative.filter((p) => !taken[p.det]), miss));
    for (const [id, j] of chosen) {
      const t = this.live.get(id)!;
      const m = ms[j];
      taken[j] = t.moved ? 2 : 1;
      hitNow.add(id);
      t.filter.predict(m.timeS);
      const nis = t.filter.update(m);
      const wasMoving = t.moved;
      const refl = learn ? this.echoes.persistent(cand[j].any, m) : null;
      // A track whose earlier spots still answer is hopping between reflectors, not driving away
      // (see FixedEchoMap.leftBehindAnswers): it does not become a moving target, and one that
      // just became one (a left spot may miss a scan or two) loses that status again.
      const recentWindow = RECENT_HITS * interval;
      const judge = learn && (!wasMoving || m.timeS - t.movedS <= recentWindow);
      // cand[j] is still current: the map learns only after every pair is decided (below).
      const leftBehind = judge && this.echoes.leftBehindAnswers(t.recent, t.departureStart(), m, interval / 2, recentWindow, cand[j]);
      if (wasMoving && leftBehind) t.demote(m);
      t.onHit(m, nis, dets[j], o.fixedEchoes.moveThresholdM, refl !== null && !wasMoving, learn ? this.echoes.settleS() : 0, leftBehind);
      // A moving track that lands on a reflector which had been answering scan after scan before
      // the track got there, and stays on it for four hits, has wandered onto it (a turn next to
      // a mount, a wall of reflectors): it loses its moving status, and with it access to
      // fixed-echo detections. A target pausing on its positioner starts its own spot's history
      // when it arrives, so it is not affected.
      // (Preexisting: the reflector was already at least the settle time old when the track
      // arrived on it; one reflector may be held as neighbouring candidates, so any such
      // reflector counts, not only the same one.)
      t.echoHits = wasMoving && refl && refl.ageS - (m.timeS - t.lastArrivalS(m)) >= this.echoes.settleS() ? t.echoHits + 1 : 0;
      if (t.echoHits >= 4) t.demote(m);
      if (this.becomesEcho(t, m.timeS, out)) continue;
      this.register(t);
      if (t.status !== 'tentative' && (t.moved || o.reportStationary)) out.updates.push(t.update(true));
    }
    for (let j = 0; j < ms.length; j++) {
      if (held && !Number.isNaN(held[j])) continue;
      if (taken[j] === 2) {
        if (learn) this.echoes.observeWith(cand[j].any, ms[j]);
        continue;
      }
      const isEcho = learn && this.echoes.learnWith(cand[j].any, ms[j], dets[j]);
      if (taken[j] || nearConfirmed[j] || isEcho) continue;
      const seed = this.seeds.take(ms[j]);
      if (!seed) {
        this.seeds.add(ms[j], dets[j]);
        continue;
      }
      // Two-point start: the seed is the first hit, this detection the second.
      const f = this.parts.createFilter(seed.m, o.filter, o.initiation.maxSpeedMps / 2, this.info!.intervalS);
      const t = new Track(this.nextId++, f, seed.m, seed.d, o.initiation);
      f.predict(ms[j].timeS);
      t.onHit(ms[j], f.update(ms[j]), dets[j], o.fixedEchoes.moveThresholdM);
      this.live.set(t.id, t);
      this.register(t);
    }
    if (now - this.lastMissCheck >= interval / 4) {
      this.lastMissCheck = now;
      this.countMisses(now, hitNow, out);
    }
    if (now - this.lastExpire >= 1) {
      this.lastExpire = now;
      this.echoes.expire(now, o.fixedEchoes.forgetS);
      for (const [id, r] of this.waiting) if (r <= now) this.waiting.delete(id);
    }
    out.updates.sort((a, b) => a.timeS - b.timeS);
  }

  /** Coasts every track whose next detection is overdue by half an interval; deletes the hopeless. */
  private countMisses(now: number, hitNow: Set<number>, out: TrackerOutput): void {
    const interval = this.info!.intervalS;
    for (const t of this.live.values()) {
      if (hitNow.has(t.id) || (this.waiting.get(t.id) ?? -Infinity) > now || now <= t.lastHitS + (t.misses + 1.5) * interval) continue;
      t.onMiss();
      if (t.failedInitiation()) {
        this.drop(t);
        continue;
      }
      t.filter.predict(now);
      const reason = this.parts.deletionReason(t, now, this.options.deletion);
      if (reason) {
        this.drop(t);
        out.deletions.push({ timeS: now, id: t.id, reason });
        continue;
      }
      this.register(t);
      if (t.status !== 'tentative' && (t.moved || this.options.reportStationary)) out.updates.push(t.update(false));
    }
  }

  /**
   * A confirmed track that never moved for `afterS` is a fixed echo: the map has learned its
   * detections meanwhile (they never went to a moving track), so the track itself is dropped.
   */
  private becomesEcho(t: Track, now: number, out: TrackerOutput): boolean {
    const fe = this.options.fixedEchoes;
    if (!fe.enabled || t.moved || t.status === 'tentative') return false;
    if (now - t.createdS < this.echoAfterS()) return false;
    // Only once the map holds the echo: until then the track is the competitor that keeps a
    // passing moving track from taking the reflector's detections.
    const m = t.lastMeasurement;
    if (!m || !(this.echoes.match(m) < Infinity)) return false;
    this.drop(t);
    out.deletions.push({ timeS: now, id: t.id, reason: 'fixed-echo' } satisfies TrackDeletion);
    return true;
  }

  private echoAfterS(): number {
    const fe = this.options.fixedEchoes;
    return fe.afterS > 0 ? fe.afterS : Math.max(10, 8 * this.info!.intervalS);
  }

  private drop(t: Track): void {
    this.live.delete(t.id);
    this.waiting.delete(t.id);
    this.index.remove(t);
  }

  /** Writes the track's gate disc, until its next expected detection, into the gate index. */
  private register(t: Track): void {
    this.index.place(t);
  }
}
