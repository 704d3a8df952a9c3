/**
 * Distances between a set of true positions X and a set of estimates Y.
 *
 * OSPA: Schuhmacher, Vo & Vo, "A consistent metric for performance evaluation of multi-object
 * filters", IEEE Trans. Signal Processing 56(8):3447–3457, 2008, eq. (3): with d^(c)(x,y) =
 * min(c, ‖x−y‖) and m = min(|X|,|Y|), n = max(|X|,|Y|),
 *   d_p^(c)(X,Y) = [ (1/n) (min_π Σ d^(c)(x_i, y_π(i))^p + c^p (n − m)) ]^(1/p).
 * GOSPA with α = 2: Rahmathullah, García-Fernández & Svensson, "Generalized optimal sub-pattern
 * assignment metric", FUSION 2017, Proposition 1:
 *   d = [ min_γ Σ_(i,j)∈γ d(x_i,y_j)^p + (c^p/2)(|X| + |Y| − 2|γ|) ]^(1/p),
 * the assignment γ pairing only points closer than c; its three terms are the localisation,
 * missed (unpaired truths) and false (unpaired estimates) parts.
 * Both are solved with one optimal assignment (Munkres 1957, npm `munkres`) on the cut-off costs
 * min(d, c)^p: a pair at the cut-off costs c^p, the same as leaving both unpaired in GOSPA.
 */
import { munkres } from 'munkres';
import type { Point } from './geometry.ts';

/** Metric parameters. */
export interface SetMetricOptions {
  /** Cut-off c, metres: an error this large counts as a miss. */
  cutoffM: number;
  /** Order p (≥ 1). */
  order: number;
}

/** Defaults: c = 1 m (a few bench noise lengths), p = 2 (common practice). */
export function resolveSetMetricOptions(o: Partial<SetMetricOptions> = {}): SetMetricOptions {
  return { cutoffM: o.cutoffM ?? 1, order: o.order ?? 2 };
}

/** OSPA and GOSPA of one instant. */
export interface SetDistance {
  ospaM: number;
  gospaM: number;
  /** GOSPA parts as p-th powers (they add up to gospaM^p): localisation, missed, false. */
  localisation: number;
  missed: number;
  false: number;
  /** Pairs closer than the cut-off. */
  assigned: number;
}

/** Optimal pairing of X and Y under cut-off costs; returns pairs [i, j] and the cut costs. */
function assign(xs: readonly Point[], ys: readonly Point[], c: number, p: number): { pairs: [number, number][]; cost: number[][] } {
  const cost = xs.map((x) => ys.map((y) => Math.min(c, Math.hypot(x.x - y.x, x.y - y.y)) ** p));
  if (xs.length === 0 || ys.length === 0) return { pairs: [], cost };
  return { pairs: munkres(cost) as [number, number][], cost };
}

/** OSPA and GOSPA (α = 2) between truths xs and estimates ys. */
export function setDistance(xs: readonly Point[], ys: readonly Point[], options: Partial<SetMetricOptions> = {}): SetDistance {
  const { cutoffM: c, order: p } = resolveSetMetricOptions(options);
  const m = Math.min(xs.length, ys.length);
  const n = Math.max(xs.length, ys.length);
  if (n === 0) return { ospaM: 0, gospaM: 0, localisation: 0, missed: 0, false: 0, assigned: 0 };
  const { pairs, cost } = assign(xs, ys, c, p);
  let sumCut = 0;
  let localisation = 0;
  let assigned = 0;
  const cp = c ** p;
  for (const [i, j] of pairs) {
    sumCut += cost[i][j];
    if (cost[i][j] < cp) {
      localisation += cost[i][j];
      assigned++;
    }
  }
  const ospaM = ((sumCut + cp * (n - m)) / n) ** (1 / p);
  const missed = (cp / 2) * (xs.length - assigned);
  const falseP = (cp / 2) * (ys.length - assigned);
  const gospaM = (localisation + missed + falseP) ** (1 / p);
  return { ospaM, gospaM, localisation, missed, false: falseP, assigned };
}
