/**
 * Tuning from a recorded run with a known commanded path: measurement noise first, then the
 * process-noise level that makes the tracker's filter consistent.
 *
 * 1. Each detection is corrected with the bench's offsets and compared with the commanded
 *    position at its time (mapped into the radar frame by the bench's positioner frame).
 *    Detections within `gateM` of it, and within 4 robust σ in range and in azimuth, are the
 *    target's. σ_range and σ_azimuth are the std of their residuals, with χ² confidence intervals
 *    ((n−1)s²/σ² ~ χ²(n−1); Papoulis & Pillai, *Probability, Random Variables and Stochastic
 *    Processes*, 4th ed., §7-4, from memory). What the positioner does besides its command
 *    (following error, vibration) counts as measurement noise here. Detections on a fixed echo
 *    (a mount, a cable joint), as the tracker's fixed-echo map learns them over the whole run,
 *    are left out first: a mount 0.3 m from where the carriage dwells lies inside the gate, and
 *    taking it in doubled the σ estimates on the rail runs.
 * 2. The chosen filter (bridge/tracking/filter.ts, used as is) runs over those detections and the
 *    process-noise level is bisected (on a log scale) until the time-averaged NIS equals its
 *    expected value n_z = 2 (nis.ts; Bar-Shalom et al. 2001 §5.4).
 */
import { EchotrailError } from '../errors.ts';
import type { Detection, FixedEcho } from '../types.ts';
import { Tracker } from '../tracking/tracker.ts';
import { gateThreshold } from '../tracking/gate.ts';
import { mahalanobis2 } from '../tracking/filter-types.ts';
import { createFilter, resolveFilterOptions, type FilterOptions } from '../tracking/filter.ts';
import { resolveMeasurementOptions, toMeasurement, type MeasurementOptions } from '../tracking/measurement.ts';
import quantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { correctDetection, type BenchConfig } from './bench-config.ts';
import { median, robustSigma } from './linalg.ts';
import { nisStats, type NisStats } from './nis.ts';
import { applyRigid } from './rigid-fit.ts';
import { samplePath, type TimedPoint } from './path.ts';

const DEG = Math.PI / 180;

export interface NoiseTuningOptions {
  /** Association radius around the commanded position, m (default 0.4). */
  gateM?: number;
  /** Filter to tune: kalman (σ_a) or imm (both levels scaled together) (default kalman). */
  filter?: 'kalman' | 'imm';
  /** NIS values dropped after each filter start, while it settles (default 5). */
  settleUpdates?: number;
  /** A gap longer than this restarts the filter, s (default 5). */
  restartGapS?: number;
  /** Search interval of σ_a (or of the IMM factor), m/s² (default [0.001, 20]). */
  searchRange?: [number, number];
  /** Fewest associated detections (default 30). */
  minSamples?: number;
  /** Leave out detections on the run's fixed echoes (default true). */
  skipFixedEchoes?: boolean;
}

export function resolveNoiseTuningOptions(o: NoiseTuningOptions = {}) {
  return { gateM: o.gateM ?? 0.4, filter: o.filter ?? 'kalman', settleUpdates: o.settleUpdates ?? 5, restartGapS: o.restartGapS ?? 5, searchRange: o.searchRange ?? ([0.001, 20] as [number, number]), minSamples: o.minSamples ?? 30, skipFixedEchoes: o.skipFixedEchoes ?? true };
}

export interface NoiseTuningResult {
  samples: number;
  /** Detections within the gate left out because they lie on a fixed echo of the run. */
  onFixedEchoes: number;
  /** Fixed echoes the run showed (the tracker's map at its end, bench-corrected frame). */
  fixedEchoes: number;
  sigmaRangeM: number;
  /** 95% confidence interval of σ_range, m. */
  sigmaRangeCiM: [number, number];
  /** Mean range residual after the bench correction, m (large: recalibrate the offsets). */
  rangeBiasM: number;
  sigmaAzimuthRad: number;
  sigmaAzimuthCiRad: [number, number];
  azimuthBiasRad: number;
  /** Filter options that make the NIS consistent (kind plus σ_a, or IMM levels). */
  filter: Partial<FilterOptions>;
  /** NIS with the tuned noise and process noise. */
  nisTuned: NisStats;
  /** NIS with the tracker's defaults (σ_range 5 cm, σ_az 1.5°, default process noise). */
  nisDefault: NisStats;
  /** False when the search hit an end of its range (then the verdict says which way). */
  bracketed: boolean;
}

const wrapPi = (a: number) => a - 2 * Math.PI * Math.floor((a + Math.PI) / (2 * Math.PI));

/** The commanded path's detections, bench-corrected, with their polar residuals. */
export function associateWithPath(detections: Iterable<Detection>, commanded: TimedPoint[], config: BenchConfig, gateM: number) {
  const rot = config.positionerFrame.rotationDeg * DEG;
  const tr = config.positionerFrame.translationM;
  const out: { d: Detection; dr: number; da: number }[] = [];
  let hint = 0;
  for (const raw of detections) {
    const c = samplePath(commanded, raw.timeS, hint);
    if (!c) continue;
    hint = c.segment;
    const p = applyRigid(c, rot, tr);
    const d = correctDetection(raw, config);
    const mx = d.rangeM * Math.sin(d.azimuthRad);
    const my = d.rangeM * Math.cos(d.azimuthRad);
    if (Math.hypot(mx - p.x, my - p.y) > gateM) continue;
    out.push({ d, dr: d.rangeM - Math.hypot(p.x, p.y), da: wrapPi(d.azimuthRad - Math.atan2(p.x, p.y)) });
  }
  return out;
}

function sigmaWithCi(v: number[]): { sigma: number; mean: number; ci: [number, number] } {
  const n = v.length;
  const mean = v.reduce((a, b) => a + b, 0) / n;
  const s2 = v.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1);
  const sigma = Math.sqrt(s2);
  return { sigma, mean, ci: [sigma * Math.sqrt((n - 1) / quantile(0.975, n - 1)), sigma * Math.sqrt((n - 1) / quantile(0.025, n - 1))] };
}

/** NIS of `filter` run over detections (time order), restarting after long gaps. */
export function runNis(dets: Detection[], filter: FilterOptions, sigmaRangeM: number, sigmaAzimuthRad: number, settle: number, restartGapS: number): number[] {
  const mo = resolveMeasurementOptions({ sigmaRangeM, sigmaAzimuthRad });
  const gaps = dets.slice(1).map((d, i) => d.timeS - dets[i].timeS).filter((g) => g > 0);
  const interval = gaps.length ? median(gaps) : 1;
  const nis: number[] = [];
  let f: ReturnType<typeof createFilter> | null = null;
  let since = 0;
  for (const d of dets) {
    const m = toMeasurement(d, mo);
    if (!f || d.timeS - f.timeS > restartGapS) {
      f = createFilter(m, filter, 1.0, interval); // 1 m/s: a bench positioner's top speed (common practice)
      since = 0;
      continue;
    }
    if (d.timeS <= f.timeS) continue; // two detections in one look: keep the first
    f.predict(d.timeS);
    const v = f.update(m);
    if (++since > settle && Number.isFinite(v)) nis.push(v);
  }
  return nis;
}

/**
 * The run's fixed echoes, learned by the tracker itself over the bench-corrected detections (its
 * map keeps a target pausing on its positioner out, see fixed-echo-map.ts), and the measurement
 * noise it inferred, to draw each echo's gate with.
 */
function fixedEchoesOf(detections: readonly Detection[], config: BenchConfig): { echoes: FixedEcho[]; sigmaRangeM: number; sigmaAzimuthRad: number } {
  const tracker = new Tracker({});
  for (const d of detections) tracker.push(correctDetection(d, config));
  tracker.flush();
  const info = tracker.inferred();
  const defaults = resolveMeasurementOptions();
  return { echoes: tracker.fixedEchoes(), sigmaRangeM: info?.sigmaRangeM ?? defaults.sigmaRangeM, sigmaAzimuthRad: info?.sigmaAzimuthRad ?? defaults.sigmaAzimuthRad };
}

/** True when the (corrected) detection falls in a fixed echo's 99 % gate (R of both, from `noise`). */
function onFixedEcho(d: Detection, echoes: readonly FixedEcho[], noise: MeasurementOptions, gamma: number): boolean {
  if (!echoes.length) return false;
  const m = toMeasurement(d, noise);
  return echoes.some((e) => mahalanobis2(m.x - e.x, m.y - e.y, 2 * m.rxx, 2 * m.rxy, 2 * m.ryy) < gamma);
}

export function tuneNoise(detections: Iterable<Detection>, commanded: TimedPoint[], config: BenchConfig, options?: NoiseTuningOptions): NoiseTuningResult {
  const o = resolveNoiseTuningOptions(options);
  const all = [...detections];
  let assoc = associateWithPath(all, commanded, config, o.gateM);
  let onFixedEchoes = 0;
  let fixedEchoes = 0;
  if (o.skipFixedEchoes && assoc.length) {
    const learned = fixedEchoesOf(all, config);
    fixedEchoes = learned.echoes.length;
    const gamma = gateThreshold(0.99, 2);
    const before = assoc.length;
    const noise = resolveMeasurementOptions(learned);
    assoc = assoc.filter((a) => !onFixedEcho(a.d, learned.echoes, noise, gamma));
    onFixedEchoes = before - assoc.length;
  }
  if (assoc.length >= 8) {
    const mr = median(assoc.map((a) => a.dr));
    const ma = median(assoc.map((a) => a.da));
    const sr = Math.max(robustSigma(assoc.map((a) => a.dr)), 1e-3);
    const sa = Math.max(robustSigma(assoc.map((a) => a.da)), 0.01 * DEG);
    assoc = assoc.filter((a) => Math.abs(a.dr - mr) <= 4 * sr && Math.abs(a.da - ma) <= 4 * sa);
  }
  if (assoc.length < o.minSamples) {
    const echoNote = onFixedEchoes ? ` (${onFixedEchoes} more lie on fixed echoes of the run and were left out)` : '';
    throw new EchotrailError('E_CALIBRATION', `tuning: only ${assoc.length} detections lie within ${o.gateM} m of the commanded path${echoNote} (need ${o.minSamples}); check the frame calibration, the run/path pairing or widen the gate; nothing was written`);
  }
  const r = sigmaWithCi(assoc.map((a) => a.dr));
  const a = sigmaWithCi(assoc.map((x) => x.da));
  const dets = assoc.map((x) => x.d);
  const base = resolveFilterOptions({ kind: o.filter });
  const make = (level: number): FilterOptions => (o.filter === 'kalman' ? { ...base, sigmaAccel: level } : { ...base, sigmaLow: base.sigmaLow * level, sigmaHigh: base.sigmaHigh * level });
  const meanNis = (level: number) => {
    const v = runNis(dets, make(level), r.sigma, a.sigma, o.settleUpdates, o.restartGapS);
    return v.length ? v.reduce((p, q) => p + q, 0) / v.length : NaN;
  };
  // Mean NIS falls as the process noise grows; bisect log(level) for mean NIS = 2.
  let [lo, hi] = o.searchRange.map(Math.log);
  let bracketed = true;
  let level: number;
  if (!(meanNis(Math.exp(hi)) <= 2)) (level = Math.exp(hi)), (bracketed = false);
  else if (!(meanNis(Math.exp(lo)) >= 2)) (level = Math.exp(lo)), (bracketed = false);
  else {
    for (let k = 0; k < 40; k++) {
      const mid = 0.5 * (lo + hi);
      if (meanNis(Math.exp(mid)) > 2) lo = mid;
      else hi = mid;
    }
    level = Math.exp(0.5 * (lo + hi));
  }
  const tuned = make(level);
  const nisTuned = nisStats(runNis(dets, tuned, r.sigma, a.sigma, o.settleUpdates, o.restartGapS));
  const defMeas = resolveMeasurementOptions();
  const nisDefault = nisStats(runNis(dets, base, defMeas.sigmaRangeM, defMeas.sigmaAzimuthRad, o.settleUpdates, o.restartGapS));
  const filter: Partial<FilterOptions> = o.filter === 'kalman' ? { kind: 'kalman', sigmaAccel: tuned.sigmaAccel } : { kind: 'imm', sigmaLow: tuned.sigmaLow, sigmaHigh: tuned.sigmaHigh };
  return {
    samples: assoc.length,
    onFixedEchoes,
    fixedEchoes,
    sigmaRangeM: r.sigma, sigmaRangeCiM: r.ci, rangeBiasM: r.mean,
    sigmaAzimuthRad: a.sigma, sigmaAzimuthCiRad: a.ci, azimuthBiasRad: a.mean,
    filter, nisTuned, nisDefault, bracketed,
  };
}
