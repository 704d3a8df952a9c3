/**
 * Which tape-measured spot disagrees with the others, by leave-one-out ("deleted") residuals.
 *
 * A spot entered 0.2 m wrong pulls the common fit towards itself, so every spot's residual
 * against that fit grows and a per-spot test against the common fit blames them all. Refitting
 * without spot i and comparing spot i with what the others alone predict does not suffer from
 * that: the wrong spot lies far from the others' prediction, a good one only as far as the wrong
 * spot's pull on the others' fit. This is the deleted (PRESS) residual and its studentized form,
 * "R-student" (Montgomery, Peck & Vining, Introduction to Linear Regression Analysis, ch. 4,
 * residual analysis; Cook & Weisberg, Residuals and Influence in Regression, 1982, ch. 2 — cited
 * from memory, no equation numbers).
 *
 * Here the observations are the spots' means, one per spot, in a weighted linear model
 *   ȳᵢ = xᵢᵀβ + uᵢ + ēᵢ,   var = τᵢ² + σ²/nᵢ =: vᵢ,
 * with uᵢ the spot's ordinary tape error (τ, assumed known: common practice) and ēᵢ the mean of its
 * nᵢ detections' noise. Both variances are known rather than estimated from the spot scatter, so
 * the deleted residual dᵢ = ȳᵢ − xᵢᵀβ̂₍₋ᵢ₎ has variance xᵢᵀ(X₍₋ᵢ₎ᵀW₍₋ᵢ₎X₍₋ᵢ₎)⁻¹xᵢ + vᵢ (the
 * others' prediction covariance plus the spot's own) and dᵢ/sd is compared with a normal bound.
 *
 * Leave-one-out can single a spot out only with redundancy to spare. With one spot more than
 * parameters (three spots for range scale and offset) the residuals span one dimension, and every
 * spot's studentized deleted residual has the same size: the spots disagree, but any one of them
 * could be the wrong one. A spot is therefore singled out only when removing it leaves the others
 * checkably consistent and removing no other candidate does; otherwise the spots "disagree".
 */
import { invertSmall } from './linalg.ts';

/** One spot's mean as an observation of the linear model. */
export interface SpotObservation {
  /** Design row: [trueRange, 1] for range scale and offset, [1] for an offset alone. */
  x: number[];
  /** The spot's mean measurement (in the model's units). */
  y: number;
  /** Variance of y about xᵀβ: tape uncertainty² + detection noise²/detections. */
  v: number;
}

export interface DeletedResidual {
  /** y − xᵀβ̂₍₋ᵢ₎: the spot against the fit of the other spots alone. */
  residual: number;
  /** Standard deviation of that difference, with the others' prediction covariance. */
  sd: number;
}

/**
 * consistent: within the bound of what the others predict; inconsistent: singled out by
 * leave-one-out; disagree: the spots disagree and this one is among those leave-one-out cannot
 * tell apart; unchecked: no redundancy to check anything with.
 */
export type SpotVerdict = 'consistent' | 'inconsistent' | 'disagree' | 'unchecked';

export interface SpotCheck {
  /** Per spot, its deleted residual among all spots; null when the others cannot predict it. */
  deleted: (DeletedResidual | null)[];
  verdicts: SpotVerdict[];
  /**
   * When the spots disagree and none could be singled out: the spot whose deleted residual is
   * clearly the largest (the one leave-one-out points at, unconfirmed), else null.
   */
  pointsAt: number | null;
  /** Spots beyond the number of parameters; below 1 nothing can be checked. */
  redundancy: number;
}

export interface SpotCheckOptions {
  /** Studentized deleted residuals beyond this disagree (default 3, as the fit's 3-standard-error bounds). */
  bound?: number;
  /**
   * How much larger the largest studentized deleted residual must be than the next for an
   * unresolved disagreement to "point at" its spot (default 1.5: a judgement, not a test).
   */
  pointRatio?: number;
}

export function resolveSpotCheckOptions(o: SpotCheckOptions = {}): Required<SpotCheckOptions> {
  return { bound: o.bound ?? 3, pointRatio: o.pointRatio ?? 1.5 };
}

/** Weighted least squares on the spots in `set`: β̂ and its covariance; null when undetermined. */
function weightedFit(obs: readonly SpotObservation[], set: readonly number[]): { beta: number[]; cov: number[][] } | null {
  const p = obs[0].x.length;
  if (set.length < p) return null;
  const n = Array.from({ length: p }, () => new Array<number>(p).fill(0));
  const b = new Array<number>(p).fill(0);
  for (const i of set) {
    const { x, y, v } = obs[i];
    for (let j = 0; j < p; j++) {
      b[j] += (x[j] * y) / v;
      for (let k = 0; k < p; k++) n[j][k] += (x[j] * x[k]) / v;
    }
  }
  const cov = invertSmall(n);
  if (!cov) return null;
  return { beta: cov.map((row) => row.reduce((s, c, k) => s + c * b[k], 0)), cov };
}

/** Spot i against the fit of the other spots of `set`. */
export function deletedResidual(obs: readonly SpotObservation[], set: readonly number[], i: number): DeletedResidual | null {
  const fit = weightedFit(obs, set.filter((j) => j !== i));
  if (!fit) return null;
  const { x, y, v } = obs[i];
  const predicted = x.reduce((s, c, k) => s + c * fit.beta[k], 0);
  const predVar = x.reduce((s, c, j) => s + c * x.reduce((t, d, k) => t + fit.cov[j][k] * d, 0), 0);
  return { residual: y - predicted, sd: Math.sqrt(predVar + v) };
}

const studentized = (d: DeletedResidual | null) => (d && d.sd > 0 ? Math.abs(d.residual / d.sd) : 0);

interface Isolation { flagged: number[]; unresolved: number[]; pointsAt: number | null }

/** Checkable (one spot to spare and a determined fit) and every spot within the bound. */
function consistent(obs: readonly SpotObservation[], set: readonly number[], bound: number): boolean {
  if (set.length - obs[0].x.length < 1 || !weightedFit(obs, set)) return false;
  return set.every((i) => studentized(deletedResidual(obs, set, i)) <= bound);
}

/** The spot with clearly the largest studentized deleted residual among `among`, else null. */
function clearlyLargest(t: Map<number, number>, among: readonly number[], ratio: number): number | null {
  const sorted = [...among].sort((a, b) => (t.get(b) ?? 0) - (t.get(a) ?? 0));
  if (sorted.length === 0) return null;
  const [first, second] = sorted;
  return second === undefined || (t.get(first) ?? 0) >= ratio * (t.get(second) ?? 0) ? first : null;
}

function isolate(obs: readonly SpotObservation[], set: readonly number[], o: Required<SpotCheckOptions>): Isolation {
  const t = new Map(set.map((i) => [i, studentized(deletedResidual(obs, set, i))]));
  const candidates = set.filter((i) => (t.get(i) ?? 0) > o.bound);
  if (candidates.length === 0) return { flagged: [], unresolved: [], pointsAt: null };
  // A spot is singled out when the others, without it, agree (checkably) and no other candidate's
  // removal would explain the disagreement as well.
  const explains = candidates.filter((i) => consistent(obs, set.filter((j) => j !== i), o.bound));
  if (explains.length === 1) return { flagged: explains, unresolved: [], pointsAt: null };
  if (explains.length > 1) return { flagged: [], unresolved: candidates, pointsAt: clearlyLargest(t, explains, o.pointRatio) };
  // No single removal explains it: two or more wrong spots, or too few spots to tell. With
  // redundancy to spare, remove the worst and look again (backward deletion, common practice).
  const worst = clearlyLargest(t, candidates, 1) as number;
  if (set.length - obs[0].x.length >= 3) {
    const rest = isolate(obs, set.filter((j) => j !== worst), o);
    if (rest.flagged.length > 0 && rest.unresolved.length === 0) return { flagged: [worst, ...rest.flagged], unresolved: [], pointsAt: null };
  }
  return { flagged: [], unresolved: candidates, pointsAt: clearlyLargest(t, candidates, o.pointRatio) };
}

/** Leave-one-out check of the spots' means against one another (see the head of this file). */
export function checkSpots(obs: readonly SpotObservation[], options?: SpotCheckOptions): SpotCheck {
  const o = resolveSpotCheckOptions(options);
  const all = obs.map((_, i) => i);
  const redundancy = obs.length - (obs[0]?.x.length ?? 0);
  const deleted = all.map((i) => deletedResidual(obs, all, i));
  if (obs.length === 0 || redundancy < 1 || !weightedFit(obs, all)) return { deleted, verdicts: all.map(() => 'unchecked'), pointsAt: null, redundancy };
  const r = isolate(obs, all, o);
  const verdicts = all.map((i): SpotVerdict => (r.flagged.includes(i) ? 'inconsistent' : r.unresolved.includes(i) ? 'disagree' : 'consistent'));
  return { deleted, verdicts, pointsAt: r.pointsAt, redundancy };
}
