import { describe, expect, it } from 'vitest';
import { gateThreshold, resolveGateOptions } from '../../bridge/tracking/gate.ts';
import { gateAgainst, mahalanobis2 } from '../../bridge/tracking/filter-types.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('χ² gate', () => {
  it('thresholds are the χ² quantiles (NIST/SEMATECH e-Handbook, χ² table)', () => {
    expect(gateThreshold(0.95, 2)).toBeCloseTo(5.9915, 4);
    expect(gateThreshold(0.99, 2)).toBeCloseTo(9.2103, 4);
    expect(gateThreshold(0.999, 2)).toBeCloseTo(13.8155, 4);
    expect(gateThreshold(0.95, 4)).toBeCloseTo(9.4877, 4);
    expect(gateThreshold(0.99, 4)).toBeCloseTo(13.2767, 4);
    expect(gateThreshold(0.999, 4)).toBeCloseTo(18.4668, 4);
  });

  it('2 dof has the closed form γ = −2 ln(1 − P_G) (χ² with 2 dof is exponential: common practice)', () => {
    for (const p of [0.5, 0.9, 0.99, 0.9999]) expect(gateThreshold(p, 2)).toBeCloseTo(-2 * Math.log(1 - p), 8);
  });

  it('d² = νᵀS⁻¹ν with S = HPHᵀ + R', () => {
    // S = [[2, 1], [1, 3]], ν = (1, 2): S⁻¹ = [[3, −1], [−1, 2]]/5 → d² = (3 − 4 + 8)/5 = 1.4.
    expect(mahalanobis2(1, 2, 2, 1, 3)).toBeCloseTo(1.4, 12);
    const g = gateAgainst({ x: 0, y: 0, pxx: 1.5, pxy: 0.5, pyy: 1 }, { timeS: 0, x: 1, y: 2, rxx: 0.5, rxy: 0.5, ryy: 2 });
    expect(g.d2).toBeCloseTo(1.4, 12);
    expect(g.logDetS).toBeCloseTo(Math.log(5), 12);
    expect(mahalanobis2(1, 1, 1, 1, 1)).toBe(Infinity); // singular S
  });

  it('refuses gate probabilities outside (0, 1)', () => {
    expect(resolveGateOptions().probability).toBe(0.99);
    for (const p of [0, 1, 1.5, NaN]) {
      let err: unknown;
      try {
        resolveGateOptions({ probability: p });
      } catch (e) {
        err = e;
      }
      expect(hasCode(err, 'E_OPTION')).toBe(true);
    }
  });
});
