/**
 * Requests to and answers from POST /api/calibrate (shapes defined by bridge/calibrate/api.ts),
 * kept pure so they can be tested. Degrees at this edge, as the calibration API expects.
 */
import { z } from 'zod';
import type { DetectionWire, PathPointWire } from '../../../bridge/server/protocol.ts';
import { MIN_REVOLUTIONS_PER_SPOT, MIN_STARING_S_PER_SPOT } from '../../../bridge/calibrate/guide.ts';
import { fixedWithMinus, formatDuration } from '../stream/format.ts';

/**
 * A spot as the panel's inputs hold it. Empty number inputs read as null (or undefined before
 * they were touched): nothing entered, which is not the same as 0.
 */
export interface MeasuredSpot {
  /** Empty: the spot is called "spot N" after its row. */
  label: string;
  /** Tape-measured position, metres (x across, y along the antenna zero). */
  x: number | null | undefined;
  y: number | null | undefined;
  /** Optional run-time span the reflector stood there, seconds. */
  fromS?: number | null;
  toS?: number | null;
}

/** A new row: nothing entered, so nothing can be fitted to a spot that is not there. */
export const emptySpot = (): MeasuredSpot => ({ label: '', x: null, y: null });

/** The name a spot goes by in requests and messages: its label, else "spot N" (its placeholder). */
export const spotName = (s: MeasuredSpot, i: number) => s.label.trim() || `spot ${i + 1}`;

const entered = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

const DEG = 180 / Math.PI;
const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Detections as the API wants them; rounded so a 12,000-detection capture stays under 1 MiB. */
export function requestDetections(dets: readonly DetectionWire[]) {
  return dets.map((d) => ({ timeS: round(d.timeS, 4), azimuthDeg: round(d.azimuthRad * DEG, 4), rangeM: round(d.rangeM, 4), amplitude: d.amplitude > 0 ? round(d.amplitude, 3) : undefined }));
}

/**
 * Why an offsets fit cannot be asked for yet, or null: a spot without its x or y (named, so the
 * user knows which row), or a capture shorter than the guide asks for even one spot. The bridge
 * checks each spot's own revolutions (bridge/calibrate/offsets.ts); this catches the obvious
 * before a round trip.
 */
export function offsetsProblem(spots: readonly MeasuredSpot[], captured: number): string | null {
  if (spots.length === 0) return 'add a tape-measured spot first';
  for (const [i, s] of spots.entries()) {
    const missing = [entered(s.x) ? '' : 'x', entered(s.y) ? '' : 'y'].filter(Boolean);
    if (missing.length) return `${spotName(s, i)}: enter its tape-measured ${missing.join(' and ')} (metres) before fitting`;
  }
  // A reflector gives about one detection per revolution: fewer detections in the whole capture
  // than the guide's revolutions for one spot cannot pass, whatever else is in the capture.
  if (captured < MIN_REVOLUTIONS_PER_SPOT) {
    return `the capture holds ${captured} detection${captured === 1 ? '' : 's'}; the guide asks for at least ${MIN_REVOLUTIONS_PER_SPOT} revolutions (or ${MIN_STARING_S_PER_SPOT} s staring) per spot: capture longer`;
  }
  return null;
}

/** Call after offsetsProblem() found nothing: spots without x or y are left out here. */
export function offsetsRequest(spots: readonly MeasuredSpot[], dets: readonly DetectionWire[], measuredBy: string) {
  return {
    action: 'offsets' as const,
    positions: spots.flatMap((s, i) => (entered(s.x) && entered(s.y)
      ? [{ label: spotName(s, i), x: s.x, y: s.y, ...(entered(s.fromS) ? { fromS: s.fromS } : {}), ...(entered(s.toS) ? { toS: s.toS } : {}) }]
      : [])),
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
  deletedRangeResidualM: z.number().optional(),
  deletedRangeSdM: z.number().optional(),
  deletedAzimuthResidualDeg: z.number().optional(),
  deletedAzimuthSdDeg: z.number().optional(),
  rangeVerdict: z.string().optional(),
  azimuthVerdict: z.string().optional(),
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
  /**
   * Leave-one-out: the spot's mean measured − what the other spots alone predict, ± the std of
   * that difference; "—" when the others cannot predict it. The figures the warnings quote.
   */
  rangeVsOthers: string;
  azimuthVsOthers: string;
  /** The fit singled this spot out (a tape or label mistake): the warnings name it. */
  rangeFlagged: boolean;
  azimuthFlagged: boolean;
  /** The spots disagree and leave-one-out cannot tell whether this one is to blame. */
  rangeDisputed: boolean;
  azimuthDisputed: boolean;
}

/** As `fixedWithMinus`, with "+" on values that are not negative (a residual reads as a direction). */
const signed = (v: number, digits: number) => {
  const text = fixedWithMinus(v, digits);
  return text.startsWith('−') ? text : `+${text}`;
};

const plusMinus = (v: number | undefined, sd: number | undefined, digits: number, unit: string) =>
  (v === undefined || sd === undefined ? '—' : `${signed(v, digits)} ± ${sd.toFixed(digits)}${unit}`);

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
      range: plusMinus(s.meanRangeResidualM * 1000, s.stdRangeResidualM * 1000, 1, ' mm'),
      azimuth: plusMinus(s.meanAzimuthResidualDeg, s.stdAzimuthResidualDeg, 2, '°'),
      rangeVsOthers: plusMinus(s.deletedRangeResidualM === undefined ? undefined : s.deletedRangeResidualM * 1000, s.deletedRangeSdM === undefined ? undefined : s.deletedRangeSdM * 1000, 1, ' mm'),
      azimuthVsOthers: plusMinus(s.deletedAzimuthResidualDeg, s.deletedAzimuthSdDeg, 2, '°'),
      // An older bridge sends the flags without verdicts.
      rangeFlagged: s.rangeVerdict !== undefined ? s.rangeVerdict === 'inconsistent' : s.rangeBeyondNoise === true,
      azimuthFlagged: s.azimuthVerdict !== undefined ? s.azimuthVerdict === 'inconsistent' : s.azimuthBeyondNoise === true,
      rangeDisputed: s.rangeVerdict === 'disagree',
      azimuthDisputed: s.azimuthVerdict === 'disagree',
    });
  }
  return rows;
}

/**
 * Detections of one pass arrive in run-time order; a step back beyond this, s, means the replay
 * went back (loop restart, seek or step back) and what follows repeats run time already captured.
 */
export const CAPTURE_BACK_TOLERANCE_S = 0.1;
/** Least forward leap after the picture restarted that counts as a seek, s (see CaptureWatch). */
export const CAPTURE_FORWARD_JUMP_S = 1;

/** Where the run time of a capture jumped. */
export interface CaptureJump {
  /** Index of the first detection after the jump: the capture keeps those before it. */
  index: number;
  /** Run time of the last detection before the jump and of the first after it, s. */
  fromS: number;
  toS: number;
}

/** The lower median of the positive gaps between consecutive detections in [from, to); NaN if none. */
function typicalGap(dets: readonly DetectionWire[], from: number, to: number): number {
  const gaps: number[] = [];
  for (let i = Math.max(from, 1); i < to; i++) {
    const g = dets[i].timeS - dets[i - 1].timeS;
    if (g > 0) gaps.push(g);
  }
  gaps.sort((a, b) => a - b);
  return gaps.length >= 5 ? gaps[(gaps.length - 1) >> 1] : NaN;
}

/**
 * Watches a capture for run-time jumps, one look per dashboard frame, and remembers where each
 * capture run (a Start press) began. The stream folds scans into the capture without asking
 * (web/src/stream/reduce.ts), so the jump is found afterwards in the detections' own times:
 * - back: any step back beyond CAPTURE_BACK_TOLERANCE_S (a loop restart, a seek or step back);
 * - forward: a leap among the detections that arrived since the picture restarted (the state's
 *   `epoch`: a seek, or the dashboard fell behind and skipped scans), longer than
 *   CAPTURE_FORWARD_JUMP_S and three typical gaps of the run, so a quiet spell is not one.
 * Only steps within one run count: a capture stopped, moved to another part of the replay and
 * started again is the user's doing (captureProblem() then checks the runs do not overlap).
 */
export class CaptureWatch {
  /** Index in the capture's detections where each run began, oldest first. */
  runs: number[] = [];
  private looked = 0;
  private epoch = 0;
  private restartPending = false;

  /** A run begins (Start pressed) with `length` detections already captured. */
  start(length: number, epoch: number): void {
    this.runs.push(length);
    this.looked = length;
    this.epoch = epoch;
    this.restartPending = false;
  }

  /** The capture was cleared. */
  reset(): void {
    this.runs = [];
    this.looked = 0;
    this.restartPending = false;
  }

  /** The capture was cut back to `length` detections (after a jump). */
  truncated(length: number): void {
    this.looked = Math.min(this.looked, length);
    this.runs = this.runs.filter((r) => r < length);
  }

  /** Looks at the detections added since the last look: the first jump among them, or null. */
  look(dets: readonly DetectionWire[], epoch: number): CaptureJump | null {
    if (this.runs.length === 0 || dets.length < this.looked) { // begun or cut back without this watch
      this.reset();
      this.start(0, epoch);
    }
    if (epoch !== this.epoch) this.restartPending = true;
    this.epoch = epoch;
    const runStart = this.runs[this.runs.length - 1];
    const from = Math.max(this.looked, runStart + 1);
    if (dets.length <= from) {
      this.looked = Math.max(this.looked, dets.length);
      return null;
    }
    const gap = this.restartPending ? typicalGap(dets, runStart, from) : NaN;
    const forwardS = Math.max(CAPTURE_FORWARD_JUMP_S, Number.isFinite(gap) ? 3 * gap : 0);
    let jump: CaptureJump | null = null;
    for (let i = from; i < dets.length && !jump; i++) {
      const step = dets[i].timeS - dets[i - 1].timeS;
      // After a restart, any step that is not forward is a jump back: stepping back one revolution
      // replays the very detection captured last (same time), which the tolerance let through.
      if (step < -CAPTURE_BACK_TOLERANCE_S || (this.restartPending && (step > forwardS || step <= 0))) jump = { index: i, fromS: dets[i - 1].timeS, toS: dets[i].timeS };
    }
    this.restartPending = false;
    this.looked = jump ? jump.index : dets.length;
    return jump;
  }
}

/**
 * What the panel says when it stopped a capture at a jump. The detections before the jump are
 * kept (see CalibrationPanel.svelte for why); the note says so and how to start over.
 */
export function captureJumpNote(j: CaptureJump, kept: number): string {
  const how = j.toS <= j.fromS ? 'back' : 'forward';
  return `capture stopped: the replay jumped ${how} from ${formatDuration(j.fromS)} to ${formatDuration(j.toS)}; kept the ${kept} detection${kept === 1 ? '' : 's'} captured before the jump. Fit them, or Clear and capture again`;
}

export interface CaptureSpan { fromS: number; toS: number; count: number }

/** The run-time span of each capture run (runs from CaptureWatch), oldest first; empty runs left out. */
export function captureSpans(dets: readonly DetectionWire[], runs: readonly number[]): CaptureSpan[] {
  const starts = runs.length && runs[0] === 0 ? runs : [0, ...runs];
  const out: CaptureSpan[] = [];
  starts.forEach((start, k) => {
    const end = Math.min(k + 1 < starts.length ? starts[k + 1] : dets.length, dets.length);
    if (end <= start) return;
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = start; i < end; i++) {
      lo = Math.min(lo, dets[i].timeS);
      hi = Math.max(hi, dets[i].timeS);
    }
    out.push({ fromS: lo, toS: hi, count: end - start });
  });
  return out;
}

/**
 * Why the capture cannot be fitted as it stands, or null: two runs over the same run time (the
 * replay was taken back between them) would count those revolutions twice and pair detections of
 * two passes with one commanded path.
 */
export function captureProblem(spans: readonly CaptureSpan[]): string | null {
  const sorted = [...spans].sort((a, b) => a.fromS - b.fromS);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i].fromS < sorted[i - 1].toS) {
      return `the capture holds two passes over the same run time (${formatDuration(sorted[i - 1].fromS)} – ${formatDuration(sorted[i - 1].toS)} and ${formatDuration(sorted[i].fromS)} – ${formatDuration(sorted[i].toS)}): Clear and capture one pass`;
    }
  }
  return null;
}
