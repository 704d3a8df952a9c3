// OSPA: Schuhmacher, Vo & Vo, "A consistent metric for performance evaluation of multi-object
// filters", IEEE Trans. SP 56(8):3447–3457, 2008, eq. (3). GOSPA (α = 2): Rahmathullah,
// García-Fernández & Svensson, "Generalized optimal sub-pattern assignment metric", FUSION 2017,
// Proposition 1. Worked values recomputed from the definitions (and here from
// the formulas by hand in the comments).
import { describe, expect, it } from 'vitest';
import { setDistance } from '../../bridge/compare/ospa.ts';

describe('setDistance', () => {
  it('X = {(0,0),(10,0)}, Y = {(1,0)}, c = 3, p = 2', () => {
    const d = setDistance([{ x: 0, y: 0 }, { x: 10, y: 0 }], [{ x: 1, y: 0 }], { cutoffM: 3, order: 2 });
    // OSPA = [(1/2)(1² + 3²·1)]^(1/2) = √5
    expect(d.ospaM).toBeCloseTo(Math.sqrt(5), 12);
    // GOSPA = [1² + (3²/2)(2 + 1 − 2)]^(1/2) = √5.5; localisation 1, missed 4.5, false 0
    expect(d.gospaM).toBeCloseTo(Math.sqrt(5.5), 12);
    expect(d.localisation).toBeCloseTo(1, 12);
    expect(d.missed).toBeCloseTo(4.5, 12);
    expect(d.false).toBe(0);
  });

  it('1-D, c = 10, p = 1: estimates i + 0.5 against truths i, i = 0..4', () => {
    const xs = [0, 1, 2, 3, 4].map((i) => ({ x: i, y: 0 }));
    const ys = [0, 1, 2, 3, 4].map((i) => ({ x: i + 0.5, y: 0 }));
    const d = setDistance(xs, ys, { cutoffM: 10, order: 1 });
    expect(d.ospaM).toBeCloseTo(0.5, 12); // (1/5)·5·0.5
    expect(d.gospaM).toBeCloseTo(2.5, 12); // 5·0.5, no normalisation in GOSPA
  });

  it('finds the optimal pairing, not the greedy one', () => {
    // Greedy nearest-first pairs x0–y0 (0.9) and leaves x1–y1 at 3.0: 0.81 + 9 = 9.81.
    // Optimal crosses: x0–y1 (1.1), x1–y0 (1.0): 1.21 + 1.0 = 2.21 (hand computation).
    const xs = [{ x: 0, y: 0 }, { x: 1.9, y: 0 }];
    const ys = [{ x: 0.9, y: 0 }, { x: -1.1, y: 0 }];
    const d = setDistance(xs, ys, { cutoffM: 5, order: 2 });
    expect(d.localisation).toBeCloseTo(2.21, 12);
    expect(d.ospaM).toBeCloseTo(Math.sqrt(2.21 / 2), 12);
  });

  it('a false track alone: OSPA is the cut-off, GOSPA splits c^p/2 into the false part', () => {
    const d = setDistance([], [{ x: 1, y: 1 }], { cutoffM: 2, order: 2 });
    expect(d.ospaM).toBeCloseTo(2, 12);
    expect(d.false).toBeCloseTo(2, 12);
    expect(d.gospaM).toBeCloseTo(Math.sqrt(2), 12);
  });

  it('a pair further apart than c counts as one missed and one false in GOSPA', () => {
    const d = setDistance([{ x: 0, y: 0 }], [{ x: 5, y: 0 }], { cutoffM: 1, order: 2 });
    expect(d.assigned).toBe(0);
    expect([d.missed, d.false, d.localisation]).toEqual([0.5, 0.5, 0]);
    expect(d.ospaM).toBeCloseTo(1, 12);
  });

  it('empty against empty is zero', () => {
    expect(setDistance([], []).gospaM).toBe(0);
  });
});
