import { describe, expect, it } from 'vitest';
import { invertSmall, leastSquares, median, robustSigma } from '../../bridge/calibrate/linalg.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('leastSquares', () => {
  it('straight-line fit matches the closed-form simple regression', () => {
    // Simple linear regression: slope = Sxy/Sxx, intercept = ȳ − slope·x̄, σ̂² = RSS/(n−2),
    // se(slope) = √(σ̂²/Sxx), se(intercept) = √(σ̂²(1/n + x̄²/Sxx)) (Draper & Smith, Applied
    // Regression Analysis, 3rd ed., ch. 1; equations from memory). Hand-computed for this data:
    // x̄ = 1.5, ȳ = 2.75, Sxx = 5, Sxy = 5.5 → slope 1.1, intercept 1.1, RSS 2.7.
    const x = [0, 1, 2, 3];
    const y = [1, 3, 2, 5];
    const r = leastSquares(x.map((v) => [v, 1]), y, 'test');
    expect(r.x[0]).toBeCloseTo(1.1, 12);
    expect(r.x[1]).toBeCloseTo(1.1, 12);
    expect(r.dof).toBe(2);
    expect(r.sigma2).toBeCloseTo(2.7 / 2, 12);
    expect(r.se[0]).toBeCloseTo(Math.sqrt(1.35 / 5), 12);
    expect(r.se[1]).toBeCloseTo(Math.sqrt(1.35 * (1 / 4 + 2.25 / 5)), 12);
    expect(r.residuals.map((v) => Number(v.toFixed(10)))).toEqual([-0.1, 0.8, -1.3, 0.6]);
  });

  it('refuses a singular design and too few rows with E_CALIBRATION', () => {
    const same = () => leastSquares([[2, 2], [3, 3], [4, 4]], [1, 2, 3], 'scale and offset');
    expect(same).toThrow(/cannot be told apart/);
    let err: unknown;
    try {
      leastSquares([[1, 1], [2, 1]], [1, 2], 'x');
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
  });

  it('inverts a small matrix', () => {
    const inv = invertSmall([[4, 1], [1, 3]])!;
    // [[4,1],[1,3]]⁻¹ = (1/11)·[[3,−1],[−1,4]]
    expect(inv[0][0]).toBeCloseTo(3 / 11, 14);
    expect(inv[0][1]).toBeCloseTo(-1 / 11, 14);
    expect(inv[1][1]).toBeCloseTo(4 / 11, 14);
    expect(invertSmall([[1, 2], [2, 4]])).toBeNull();
  });

  it('median and the MAD-based robust σ', () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    // 1.4826·MAD: for [1..5] the MAD is 1 (common practice constant 1.4826 = 1/Φ⁻¹(3/4)).
    expect(robustSigma([1, 2, 3, 4, 5])).toBeCloseTo(1.4826, 12);
  });
});
