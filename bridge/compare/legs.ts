/**
 * The commanded path cut into legs for per-leg figures: straight runs between corners and holds.
 * Labels from the input (a `segment` column, waypoint legs) win; otherwise a new leg starts where
 * the commanded direction turns by more than a corner angle or the positioner starts or stops.
 */
import { headingOf, wrapAngle } from './geometry.ts';
import type { TimedPath } from './timed-path.ts';

/** How legs are found when the input does not label them. */
export interface LegOptions {
  /** A turn sharper than this between consecutive segments starts a new leg, degrees. */
  cornerDeg: number;
  /** Below this speed a segment counts as a hold, m/s. */
  holdSpeedMps: number;
  /**
   * Legs this short or shorter join the leg before (ramps at corners and the run's last half second
   * make slivers of a few centimetres, whose one or two samples give no figures worth a table row),
   * seconds.
   */
  minLegS: number;
}

/** Defaults in one place. */
export function resolveLegOptions(o: Partial<LegOptions> = {}): LegOptions {
  return { cornerDeg: o.cornerDeg ?? 20, holdSpeedMps: o.holdSpeedMps ?? 1e-3, minLegS: o.minLegS ?? 1 };
}

/** One leg of the commanded path. */
export interface Leg {
  index: number;
  kind: 'move' | 'hold';
  /** Path segments [firstSegment, lastSegment] it covers. */
  firstSegment: number;
  lastSegment: number;
  startS: number;
  endS: number;
  /** Commanded length, metres, and mean commanded speed, m/s. */
  lengthM: number;
  speedMps: number;
}

/** Legs of a path, and for each path segment the index of its leg. */
export function findLegs(path: TimedPath, options: Partial<LegOptions> = {}): { legs: Leg[]; legOfSegment: number[] } {
  const o = resolveLegOptions(options);
  const pts = path.points;
  const nSeg = pts.length - 1;
  const legOfSegment: number[] = new Array(nSeg);
  let leg = 0;
  let prevHeading: number | null = null;
  let prevHold: boolean | null = null;
  for (let i = 0; i < nSeg; i++) {
    const dx = pts[i + 1].x - pts[i].x;
    const dy = pts[i + 1].y - pts[i].y;
    const hold = Math.hypot(dx, dy) / (pts[i + 1].timeS - pts[i].timeS) < o.holdSpeedMps;
    const heading = hold ? null : headingOf(dx, dy);
    if (i > 0) {
      let split: boolean;
      if (path.legs) split = path.legs[i] !== path.legs[i - 1];
      else if (hold !== prevHold) split = true;
      else split = heading !== null && prevHeading !== null && Math.abs(wrapAngle(heading - prevHeading)) > (o.cornerDeg * Math.PI) / 180;
      if (split) leg++;
    }
    legOfSegment[i] = leg;
    prevHeading = heading;
    prevHold = hold;
  }
  mergeSlivers(path, legOfSegment, o.minLegS);
  const legs: Leg[] = [];
  for (let i = 0; i < nSeg; i++) {
    const k = legOfSegment[i];
    if (!legs[k]) legs[k] = { index: k, kind: 'move', firstSegment: i, lastSegment: i, startS: pts[i].timeS, endS: 0, lengthM: 0, speedMps: 0 };
    const l = legs[k];
    l.lastSegment = i;
    l.endS = pts[i + 1].timeS;
    l.lengthM = path.cumulativeM[i + 1] - path.cumulativeM[l.firstSegment];
  }
  // A leg is a hold when it spends most of its time holding: a folded sliver (the last half second
  // of a ramp) must not turn a 3 s dwell into a "move".
  const holdS = new Array<number>(legs.length).fill(0);
  for (let i = 0; i < nSeg; i++) {
    const dt = pts[i + 1].timeS - pts[i].timeS;
    if (Math.hypot(pts[i + 1].x - pts[i].x, pts[i + 1].y - pts[i].y) / dt < o.holdSpeedMps) holdS[legOfSegment[i]] += dt;
  }
  for (const l of legs) {
    l.speedMps = l.lengthM / (l.endS - l.startS);
    l.kind = l.speedMps < o.holdSpeedMps || holdS[l.index] > (l.endS - l.startS) / 2 ? 'hold' : 'move';
  }
  return { legs, legOfSegment };
}

/** Relabel legs shorter than minLegS into their predecessor (the first into its successor), then renumber 0… */
function mergeSlivers(path: TimedPath, legOfSegment: number[], minLegS: number): void {
  const pts = path.points;
  const span = new Map<number, { start: number; end: number }>();
  legOfSegment.forEach((l, i) => {
    const s = span.get(l) ?? { start: pts[i].timeS, end: pts[i + 1].timeS };
    s.end = pts[i + 1].timeS;
    span.set(l, s);
  });
  const ids = [...span.keys()];
  const target = new Map<number, number>();
  let prevKept: number | null = null;
  for (const id of ids) {
    const s = span.get(id)!;
    // ≤ with a margin: path times are decimals (119.5, 120.0) that need not difference exactly.
    if (s.end - s.start <= minLegS + 1e-9 && ids.length > 1) target.set(id, prevKept ?? -1);
    else {
      target.set(id, id);
      // A leading sliver joins the first kept leg.
      for (const [k, v] of target) if (v === -1) target.set(k, id);
      prevKept = id;
    }
  }
  const renumber = new Map<number, number>();
  for (let i = 0; i < legOfSegment.length; i++) {
    const t = target.get(legOfSegment[i])!;
    const keep = t === -1 ? legOfSegment[i] : t;
    if (!renumber.has(keep)) renumber.set(keep, renumber.size);
    legOfSegment[i] = renumber.get(keep)!;
  }
}

