import { describe, expect, it } from 'vitest';
import { solveSparse, type SparseProblem } from '../../bridge/tracking/sparse-assignment.ts';
import { solveDense } from '../helpers/dense-assignment.ts';
import { createRng } from '../../bridge/sim/prng.ts';

const FORBIDDEN = 1e12;

/** A random sparse problem: each row gated to a few columns, costs of either sign (d² + ln|S|). */
function randomProblem(seed: number, rows: number, cols: number, degree: number): SparseProblem & { dense: number[][] } {
  const rng = createRng(seed);
  const dense = Array.from({ length: rows }, () => new Array<number>(cols).fill(FORBIDDEN));
  const start = [0];
  const col: number[] = [];
  const cost: number[] = [];
  for (let r = 0; r < rows; r++) {
    const seen = new Set<number>();
    const k = 1 + Math.floor(rng.uniform() * degree);
    // Neighbouring columns, as overlapping gates give: conflicts chain along the row index.
    for (let n = 0; n < k; n++) {
      const c = Math.min(cols - 1, Math.max(0, Math.round((r * cols) / rows + rng.between(-3, 3))));
      if (seen.has(c)) continue;
      seen.add(c);
      const v = rng.between(-6, 10);
      col.push(c);
      cost.push(v);
      dense[r][c] = v;
    }
    start.push(col.length);
  }
  const missCost = Float64Array.from({ length: rows }, () => rng.between(2, 12));
  return { rows, cols, rowStart: Int32Array.from(start), edgeCol: Int32Array.from(col), edgeCost: Float64Array.from(cost), missCost, dense };
}

function total(p: ReturnType<typeof randomProblem>, sol: ArrayLike<number>): number {
  let s = 0;
  for (let r = 0; r < p.rows; r++) s += sol[r] >= 0 ? p.dense[r][sol[r]] : p.missCost[r];
  return s;
}

describe('solveSparse', () => {
  it('reaches the optimum of the Hungarian method (npm munkres) on random sparse problems up to 60 rows', () => {
    // Reference: Kuhn (1955) / Munkres (1957) as implemented by the npm package `munkres`, on the
    // same problem written densely with one "missed" column per row (assignment.ts solveDense).
    for (let seed = 1; seed <= 40; seed++) {
      const rows = 5 + (seed % 12) * 5;
      const cols = Math.max(1, Math.round(rows * (0.6 + (seed % 5) * 0.2)));
      const p = randomProblem(seed, rows, cols, 4);
      const sparse = solveSparse(p);
      const dense = solveDense(p.dense, Array.from(p.missCost));
      expect(total(p, sparse)).toBeCloseTo(total(p, dense), 9);
      // A feasible matching: no column twice, only gated columns.
      const used = [...sparse].filter((c) => c >= 0);
      expect(new Set(used).size).toBe(used.length);
      for (let r = 0; r < rows; r++) if (sparse[r] >= 0) expect(p.dense[r][sparse[r]]).toBeLessThan(FORBIDDEN);
    }
  });

  it('leaves a row on its miss column when every gated column is dearer or better used elsewhere', () => {
    // Row 0 gated to column 0 only (cost 1); row 1 to column 0 (cost 0) and column 1 (cost 9).
    // Optimum: row 1 takes column 0 only if row 0 then misses (5): 0 + 5 = 5 against 1 + min(9, 4) = 5
    // with row 1 missing at 4: ties are broken either way, so make row 1's miss 3: 1 + 3 = 4 wins.
    const p: SparseProblem = { rows: 2, cols: 2, rowStart: Int32Array.from([0, 1, 3]), edgeCol: Int32Array.from([0, 0, 1]), edgeCost: Float64Array.from([1, 0, 9]), missCost: Float64Array.from([5, 3]) };
    expect([...solveSparse(p)]).toEqual([0, -1]);
  });

  it('solves a long chain of conflicts exactly, where taking the cheapest pair first fails', () => {
    // Row r gated to column r (cost 1) and, but for the last row, to column r+1 (cost 0). Taking
    // the cheapest pairs first puts every row but the last on r+1 and leaves the last one only its
    // miss (1000): 1000 in all. A row on its own column forces every row before it onto its own
    // column too, so the optimum is every row on column r: n.
    const n = 200;
    const start = [0];
    const col: number[] = [];
    const cost: number[] = [];
    for (let r = 0; r < n; r++) {
      col.push(r);
      cost.push(1);
      if (r + 1 < n) {
        col.push(r + 1);
        cost.push(0);
      }
      start.push(col.length);
    }
    const p: SparseProblem = { rows: n, cols: n, rowStart: Int32Array.from(start), edgeCol: Int32Array.from(col), edgeCost: Float64Array.from(cost), missCost: new Float64Array(n).fill(1000) };
    const sol = solveSparse(p);
    expect([...sol]).toEqual(Array.from({ length: n }, (_, r) => r));
  });
});

describe('solveSparse working arrays', () => {
  it('gives the same answers when called again on smaller and larger problems (arrays reused between calls)', () => {
    const first = [30, 5, 60, 12].map((rows, k) => {
      const p = randomProblem(100 + k, rows, rows, 4);
      return { p, total: total(p, solveSparse(p)) };
    });
    for (const { p, total: t } of first.reverse()) expect(total(p, solveSparse(p))).toBeCloseTo(t, 12);
    for (const { p } of first) expect(total(p, solveSparse(p))).toBeCloseTo(total(p, solveDense(p.dense, Array.from(p.missCost))), 9);
  });
});
