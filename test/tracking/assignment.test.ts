import { describe, expect, it } from 'vitest';
import { assign, type GatedPair } from '../../bridge/tracking/assignment.ts';
import { solveDense } from '../helpers/dense-assignment.ts';
import { createRng } from '../../bridge/sim/prng.ts';

describe('GNN assignment', () => {
  it('solves the textbook example (Kuhn 1955, Munkres 1957; example of SciPy linear_sum_assignment)', () => {
    const C = [[4, 1, 3], [2, 0, 5], [3, 2, 2]];
    const sol = solveDense(C, [100, 100, 100]);
    expect(sol).toEqual([1, 0, 2]);
    expect(sol.reduce((s, c, r) => s + C[r][c], 0)).toBe(5);
  });

  it('pads with a "missed" column per track, so a track may stay unassigned', () => {
    // Track 1's only option costs more than missing: it takes nothing.
    expect(solveDense([[1, 9], [8, 50]], [5, 5])).toEqual([0, -1]);
    // More detections than tracks stays feasible.
    expect(solveDense([[3, 1, 2]], [5])).toEqual([1]);
  });

  it('equals the brute-force optimum over random sparse problems', () => {
    const rng = createRng(2);
    for (let trial = 0; trial < 50; trial++) {
      const nt = 1 + Math.floor(rng.uniform() * 5);
      const nd = 1 + Math.floor(rng.uniform() * 5);
      const pairs: GatedPair[] = [];
      for (let t = 0; t < nt; t++) for (let d = 0; d < nd; d++) if (rng.uniform() < 0.5) pairs.push({ track: t * 7, det: d, cost: rng.uniform() * 10 });
      const miss = 6;
      const got = assign(pairs, () => miss);
      const cost = (a: Array<[number, number]>) =>
        a.reduce((s, [t, d]) => s + pairs.find((p) => p.track === t && p.det === d)!.cost, 0) + miss * (nt - a.length);
      expect(cost(got)).toBeCloseTo(bruteForce(pairs, nt, nd, miss), 9);
      // Each track and each detection used at most once.
      expect(new Set(got.map((g) => g[0])).size).toBe(got.length);
      expect(new Set(got.map((g) => g[1])).size).toBe(got.length);
    }
  });
});

/** Minimum over all partial matchings (tracks t*7, detections 0..nd−1), tracks not taken pay `miss`. */
function bruteForce(pairs: GatedPair[], nt: number, nd: number, miss: number): number {
  const cost = new Map(pairs.map((p) => [`${p.track}:${p.det}`, p.cost]));
  let best = Infinity;
  const rec = (t: number, used: Set<number>, acc: number) => {
    if (t === nt) {
      best = Math.min(best, acc);
      return;
    }
    rec(t + 1, used, acc + miss);
    for (let d = 0; d < nd; d++) {
      const c = cost.get(`${t * 7}:${d}`);
      if (c === undefined || used.has(d)) continue;
      used.add(d);
      rec(t + 1, used, acc + c);
      used.delete(d);
    }
  };
  rec(0, new Set(), 0);
  return best;
}
