/**
 * What `echotrail compare` writes besides the report: summary.json (every figure, versioned) and
 * the time series as CSV. Units are in the key and column names; angles in degrees at this edge.
 */
import type { Analysis } from './analyse.ts';
import type { Deviation } from './deviation.ts';
import { timeSpan } from './timed-path.ts';

/** Bump when a key changes meaning or disappears. */
export const SUMMARY_VERSION = 1;

/** Where the inputs came from, for the record. */
export interface SummaryMeta {
  tracks: string;
  commanded: string[];
  /** Warnings met while reading (folded duplicate records, ignored kinds). */
  warnings: string[];
}

const r6 = (v: number | null) => (v === null || !Number.isFinite(v) ? null : Math.round(v * 1e6) / 1e6);
/** Lags to 0.1 ms: the estimate is good to a few milliseconds at best. */
const r4 = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : Math.round(v * 1e4) / 1e4);

/**
 * Every number of the summary to 1e-6 (µm, µs, 1e-6 m/s, 1e-6°), integers untouched, so that no
 * figure carries binary float noise (0.23720000000000008). Integer ÷ 1e6 is correctly rounded, so
 * the value prints as its shortest decimal.
 */
export function roundForJson(_key: string, v: unknown): unknown {
  return typeof v === 'number' && Number.isFinite(v) && !Number.isInteger(v) ? Math.round(v * 1e6) / 1e6 : v;
}

/** The JSON summary. */
export function buildSummary(a: Analysis, meta: SummaryMeta): Record<string, unknown> {
  const span = timeSpan(a.commanded);
  const fRmse = a.whole.filtered.aligned.position.rmse;
  const sRmse = a.whole.smoothed?.aligned.position.rmse ?? null;
  return {
    format: 'echotrail-compare-summary',
    version: SUMMARY_VERSION,
    inputs: meta,
    commanded: {
      points: a.commanded.points.length,
      start_s: span.startS,
      end_s: span.endS,
      length_m: r6(a.commanded.cumulativeM[a.commanded.cumulativeM.length - 1]),
      legs: a.legs.length,
    },
    tracks: { ids: a.trackIds, followed_rows: a.followed.length, switches: a.switches.map((s) => ({ time_s: s.timeS, from: s.from, to: s.to })),
      released: a.releases.map((r) => ({ time_s: r.timeS, id: r.id, distance_m: r6(r.distanceM) })) },
    coverage: { confirmed_fraction: r6(a.coverage.confirmedFraction), coasting_fraction: r6(a.coverage.coastingFraction), gap_limit_s: r6(a.coverage.gapLimitS) },
    lag: {
      lag_s: r4(a.lag.lagS),
      // Which track the lag was found on: 'smoothed' (RTS, no filter lag) or 'filtered' (the live track).
      estimated_on: a.lagSource,
      ci_low_s: r4(a.lagInterval?.lowS),
      ci_high_s: r4(a.lagInterval?.highS),
      ci_level: a.lagInterval?.level ?? null,
      significant: a.lagInterval ? a.lagInterval.significant : null,
      undetermined: a.lagInterval ? a.lagInterval.undetermined : null,
      filtered_track_lag_s: r4(a.filteredLag.lagS),
      rms_at_lag_m: r6(a.lag.rmsAtLagM), rms_at_zero_m: r6(a.lag.rmsAtZeroM), samples: a.lag.samples, outliers: a.lag.outliers,
    },
    whole_run: { filtered: a.whole.filtered, smoothed: a.whole.smoothed },
    smoothed_to_filtered_rmse: fRmse && sRmse !== null ? r6(sRmse / fRmse) : null,
    legs: a.perLeg.map((l) => ({
      index: l.leg.index,
      kind: l.leg.kind,
      start_s: l.leg.startS,
      end_s: l.leg.endS,
      length_m: r6(l.leg.lengthM),
      speed_mps: r6(l.leg.speedMps),
      filtered: l.filtered,
      smoothed: l.smoothed,
    })),
    multi_target: { ...a.setSummary, settings: a.setOptions },
    settings: { follow: a.settings.follow, lag: a.settings.lag, legs: a.settings.legs, smoother: a.settings.smoother, min_overlap: a.settings.minOverlap },
    units: {
      position: 'm', along: 'm, ahead of the commanded point positive', cross: 'm, left of the commanded direction positive',
      speed: 'm/s, track minus commanded', headingDeg: 'degrees, track minus commanded, clockwise positive',
      gospa_parts: 'm² (p-th powers, p = 2): localisation + missed + false = GOSPA²',
    },
  };
}

const num = (v: number | null | undefined, digits = 5) => (v === null || v === undefined || !Number.isFinite(v) ? '' : v.toFixed(digits));

/** Per-sample series of the followed track: filtered and smoothed, raw and lag-aligned. */
export function seriesCsv(a: Analysis): string {
  const head = [
    'time_s', 'track_id', 'status', 'track_x_m', 'track_y_m', 'cmd_x_m', 'cmd_y_m', 'error_m', 'along_m', 'cross_m',
    'speed_error_mps', 'heading_error_deg', 'aligned_error_m', 'aligned_along_m', 'aligned_cross_m',
    'smoothed_x_m', 'smoothed_y_m', 'smoothed_error_m', 'smoothed_aligned_error_m', 'smoothed_aligned_cross_m',
  ];
  const lines = [head.join(',')];
  a.followed.forEach((row, i) => {
    const d: Deviation = a.filtered.noLag[i];
    const al = a.filtered.aligned[i];
    const k = a.smoothed ? i - a.smoothed.offset : -1;
    const s = a.smoothed && k >= 0 ? a.smoothed.states[k] : null;
    const sd = a.smoothed && k >= 0 ? a.smoothed.deviations.noLag[k] : null;
    const sa = a.smoothed && k >= 0 ? a.smoothed.deviations.aligned[k] : null;
    lines.push([
      num(row.timeS, 4), row.id, row.status, num(row.x), num(row.y), num(d.cmdX), num(d.cmdY), num(d.positionM), num(d.alongM), num(d.crossM),
      num(d.speedMps), num(d.headingRad === null ? null : (d.headingRad * 180) / Math.PI, 3), num(al.positionM), num(al.alongM), num(al.crossM),
      num(s?.x), num(s?.y), num(sd?.positionM), num(sa?.positionM), num(sa?.crossM),
    ].join(','));
  });
  return lines.join('\n') + '\n';
}

/** OSPA/GOSPA series. */
export function setsCsv(a: Analysis): string {
  const lines = ['time_s,truths,estimates,ospa_m,gospa_m,gospa_localisation_m2,gospa_missed_m2,gospa_false_m2'];
  for (const s of a.sets) lines.push([num(s.timeS, 4), s.truths, s.estimates, num(s.ospaM), num(s.gospaM), num(s.localisation), num(s.missed), num(s.false)].join(','));
  return lines.join('\n') + '\n';
}

/** The lag cost curve. */
export function lagCsv(a: Analysis): string {
  return ['lag_s,rms_m', ...a.lag.curve.map((c) => `${num(c.lagS, 4)},${num(c.rmsM)}`)].join('\n') + '\n';
}
