/**
 * Requests to and answers from POST /api/calibrate (shapes defined by bridge/calibrate/api.ts),
 * kept pure so they can be tested. Degrees at this edge, as the calibration API expects.
 */
import { z } from 'zod';
import type { DetectionWire, PathPointWire } from '../../../bridge/server/protocol.ts';
import { fixedWithMinus } from '../stream/format.ts';

export interface MeasuredSpot {
  label: string;
  /** Tape-measured position, metres (x across, y along the antenna zero). */
  x: number;
  y: number;
  /** Optional run-time span the reflector stood there, seconds. */
  fromS?: number;
  toS?: number;
}

const DEG = 180 / Math.PI;
const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Detections as the API wants them; rounded so a 12,000-detection capture stays under 1 MiB. */
export function requestDetections(dets: readonly DetectionWire[]) {
  return dets.map((d) => ({ timeS: round(d.timeS, 4), azimuthDeg: round(d.azimuthRad * DEG, 4), rangeM: round(d.rangeM, 4), amplitude: d.amplitude > 0 ? round(d.amplitude, 3) : undefined }));
}

export function offsetsRequest(spots: readonly MeasuredSpot[], dets: readonly DetectionWire[], measuredBy: string) {
  return {
    action: 'offsets' as const,
    positions: spots.map((s) => ({ label: s.label || undefined, x: s.x, y: s.y, fromS: s.fromS, toS: s.toS })),
    detections: requestDetections(dets),
    fitScale: 'auto' as const,
    ...(measuredBy.trim() ? { measuredBy: measuredBy.trim() } : {}),
  };
}

/**
 * `allowStraightPath` lets the fit accept a straight commanded path (a rail run), which the API
 * otherwise refuses: the rotation then comes from the line's direction and the cross-track offsets,
 * and a tracking lag along the line is taken up by the shift along it (bridge/calibrate/rigid-fit.ts).
 */
export function frameRequest(dets: readonly DetectionWire[], commanded: readonly PathPointWire[], measuredBy: string, allowStraightPath = false) {
  return {
    action: 'frame' as const,
    detections: requestDetections(dets),
    commanded: commanded.map((p) => ({ timeS: p.timeS, x: p.x, y: p.y })),
    ...(allowStraightPath ? { allowCollinear: true } : {}),
    ...(measuredBy.trim() ? { measuredBy: measuredBy.trim() } : {}),
  };
}

/** What is checked of an answer before it is shown; the proposed config is passed through as is. */
export const calibrationAnswer = z.union([
  z.object({ ok: z.literal(true), action: z.literal('steps'), steps: z.array(z.string()) }),
  z.object({
    ok: z.literal(true), action: z.enum(['offsets', 'frame', 'tune']),
    summary: z.record(z.string(), z.union([z.number(), z.string(), z.boolean()])),
    reflectors: z.array(z.record(z.string(), z.union([z.number(), z.string(), z.boolean()]))).optional(),
    warnings: z.array(z.string()).optional(),
    config: z.unknown(),
  }),
  z.object({ ok: z.literal(false), code: z.string(), message: z.string() }),
]);
export type CalibrationAnswer = z.infer<typeof calibrationAnswer>;

export interface SummaryRow { label: string; value: string }

/** Labels and units of the summary fields the calibration API sends (bridge/calibrate/report.ts). */
const KNOWN: Record<string, { label: string; unit: 'm' | 'deg' | 'ratio' | 'count' }> = {
  rangeOffsetM: { label: 'Range offset', unit: 'm' },
  rangeOffsetSeM: { label: 'Range offset, std. error', unit: 'm' },
  rangeScale: { label: 'Range scale', unit: 'ratio' },
  rangeScaleSe: { label: 'Range scale, std. error', unit: 'ratio' },
  azimuthOffsetDeg: { label: 'Azimuth offset', unit: 'deg' },
  azimuthOffsetSeDeg: { label: 'Azimuth offset, std. error', unit: 'deg' },
  sigmaRangeM: { label: 'Range noise σ', unit: 'm' },
  sigmaAzimuthDeg: { label: 'Azimuth noise σ', unit: 'deg' },
  detectionsUsed: { label: 'Detections used', unit: 'count' },
  rotationDeg: { label: 'Frame rotation', unit: 'deg' },
  rotationSeDeg: { label: 'Frame rotation, std. error', unit: 'deg' },
  translationXM: { label: 'Frame shift x', unit: 'm' },
  translationYM: { label: 'Frame shift y', unit: 'm' },
  translationSeXM: { label: 'Frame shift x, std. error', unit: 'm' },
  translationSeYM: { label: 'Frame shift y, std. error', unit: 'm' },
  rmsM: { label: 'Residual RMS', unit: 'm' },
  maxM: { label: 'Residual max', unit: 'm' },
  pairs: { label: 'Pairs matched', unit: 'count' },
  candidates: { label: 'Candidate pairs', unit: 'count' },
};

export interface SummaryRow { label: string; value: string }

/** Summary fields → labelled values with units; unknown fields get a unit from their suffix (…M, …Deg). */
export function summaryRows(summary: Record<string, number | string | boolean>): SummaryRow[] {
  return Object.entries(summary).map(([key, v]) => {
    const known = KNOWN[key];
    const unit = known?.unit ?? (/Deg$/.test(key) ? 'deg' : /M$/.test(key) ? 'm' : undefined);
    const label = known?.label ?? key.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase();
    if (typeof v !== 'number') return { label, value: String(v) };
    // The offsets fit sends no standard error for a scale it did not fit (held at 1).
    if (key === 'rangeScale' && !('rangeScaleSe' in summary)) return { label, value: `${withUnit(v, unit)}, not fitted` };
    return { label, value: withUnit(v, unit) };
  });
}


function withUnit(v: number, unit: 'm' | 'deg' | 'ratio' | 'count' | undefined): string {
  if (unit === 'm') return `${fixedWithMinus(v, 4)} m`;
  if (unit === 'deg') return `${fixedWithMinus(v, 3)}°`;
  if (unit === 'ratio') return `${fixedWithMinus(v, 5)} (×)`;
  return Number.isInteger(v) ? fixedWithMinus(v, 0) : fixedWithMinus(v, 4);
}

/** One measured spot's residuals as the offsets answer gives them (bridge/calibrate/api.ts). */
const spotResidual = z.object({
  label: z.string(),
  detections: z.number(),
  meanRangeResidualM: z.number(),
  stdRangeResidualM: z.number(),
  meanAzimuthResidualDeg: z.number(),
  stdAzimuthResidualDeg: z.number(),
  rangeBeyondNoise: z.boolean().optional(),
  azimuthBeyondNoise: z.boolean().optional(),
});

export interface SpotRow {
  label: string;
  detections: string;
  /** Mean ± std of measured − fitted range, mm. */
  range: string;
  /** Mean ± std of measured − fitted azimuth, degrees. */
  azimuth: string;
  /** The fit found this spot's mean beyond its noise (a tape or label mistake). */
  rangeFlagged: boolean;
  azimuthFlagged: boolean;
}

/** As `fixedWithMinus`, with "+" on values that are not negative (a residual reads as a direction). */
const signed = (v: number, digits: number) => {
  const text = fixedWithMinus(v, digits);
  return text.startsWith('−') ? text : `+${text}`;
};

/** The per-spot residual table of an offsets fit; entries that do not read as a spot are left out. */
export function spotRows(reflectors: readonly Record<string, unknown>[] | undefined): SpotRow[] {
  const rows: SpotRow[] = [];
  for (const raw of reflectors ?? []) {
    const r = spotResidual.safeParse(raw);
    if (!r.success) continue;
    const s = r.data;
    rows.push({
      label: s.label,
      detections: String(s.detections),
      range: `${signed(s.meanRangeResidualM * 1000, 1)} ± ${(s.stdRangeResidualM * 1000).toFixed(1)} mm`,
      azimuth: `${signed(s.meanAzimuthResidualDeg, 2)} ± ${s.stdAzimuthResidualDeg.toFixed(2)}°`,
      rangeFlagged: s.rangeBeyondNoise === true,
      azimuthFlagged: s.azimuthBeyondNoise === true,
    });
  }
  return rows;
}
