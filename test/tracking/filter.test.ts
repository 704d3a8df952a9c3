import { describe, expect, it } from 'vitest';
import { createFilter, resolveFilterOptions } from '../../bridge/tracking/filter.ts';
import { AlphaBetaFilter, kalataGains } from '../../bridge/tracking/alpha-beta.ts';
import { ImmCv2 } from '../../bridge/tracking/imm.ts';
import { KalmanCv } from '../../bridge/tracking/kalman-cv.ts';
import { hasCode } from '../../bridge/errors.ts';

const m = { timeS: 0, x: 1, y: 2, rxx: 0.01, rxy: 0, ryy: 0.01 };

describe('filter selection', () => {
  it('defaults to the IMM and builds each kind', () => {
    expect(resolveFilterOptions().kind).toBe('imm');
    expect(createFilter(m, resolveFilterOptions(), 0.75, 1)).toBeInstanceOf(ImmCv2);
    expect(createFilter(m, resolveFilterOptions({ kind: 'kalman' }), 0.75, 1)).toBeInstanceOf(KalmanCv);
    expect(createFilter(m, resolveFilterOptions({ kind: 'alpha-beta' }), 0.75, 1)).toBeInstanceOf(AlphaBetaFilter);
  });

  it("alpha-beta gains come from Kalata's index λ = σ_w·T²/σ_v (Kalata 1984)", () => {
    // σ_w = 0.1, T = 1, σ_v = 0.1 → λ = 1 → α = 0.75, β = 0.5: the filter's gate variance
    // α/(1−α)·R = 3R shows the gains it took (Bar-Shalom et al. 2001, §6.5).
    const f = createFilter(m, resolveFilterOptions({ kind: 'alpha-beta', sigmaAccel: 0.1 }), 0.75, 1);
    f.predict(1);
    f.update({ ...m, timeS: 1 });
    expect(f.peek(2).pxx).toBeCloseTo(3 * 0.01, 12);
    expect(kalataGains(1).alpha).toBeCloseTo(0.75, 12);
  });

  it('refuses unknown kinds and half-given gains', () => {
    for (const bad of [{ kind: 'ekf' as never }, { alpha: 0.5 }, { sigmaHigh: -1 }, { processNoise: 'x' as never }]) {
      let err: unknown;
      try {
        resolveFilterOptions(bad);
      } catch (e) {
        err = e;
      }
      expect(hasCode(err, 'E_OPTION')).toBe(true);
    }
  });
});
