import { describe, expect, it } from 'vitest';
import { AlphaBetaFilter, alphaBetaStable, kalataGains, trackingIndex } from '../../bridge/tracking/alpha-beta.ts';
import type { Measurement } from '../../bridge/types.ts';

const m = (timeS: number, x: number): Measurement => ({ timeS, x, y: 0, rxx: 1, rxy: 0, ryy: 1 });

describe('alpha-beta filter', () => {
  it("Kalata's gains from the tracking index (Kalata 1984, IEEE Trans. AES 20(2), α(λ), β(λ))", () => {
    // Worked values recomputed from Kalata's closed form (Kalata 1984, IEEE Trans. AES 20(2)).
    const cases: [number, number, number][] = [
      [0.1, 0.36, 0.08],
      [1 / 3, 5 / 9, 2 / 9],
      [1, 0.75, 0.5],
      [4, 4 * Math.sqrt(3) - 6, 8 - 4 * Math.sqrt(3)],
    ];
    for (const [lambda, a, b] of cases) {
      const g = kalataGains(lambda);
      expect(g.alpha).toBeCloseTo(a, 10);
      expect(g.beta).toBeCloseTo(b, 10);
      // Kalata 1984: identity λ² = β²/(1 − α).
      expect(lambda * lambda).toBeCloseTo((g.beta * g.beta) / (1 - g.alpha), 10);
      expect(alphaBetaStable(g.alpha, g.beta)).toBe(true);
    }
  });

  it('tracking index λ = σ_w·T²/σ_v (Kalata 1984)', () => {
    expect(trackingIndex(2, 0.5, 0.25)).toBeCloseTo(2, 12);
  });

  it('stability region 0 < α < 2, 0 < β < 4 − 2α (Brookner 1998)', () => {
    expect(alphaBetaStable(0.5, 2.9)).toBe(true);
    expect(alphaBetaStable(0.5, 3.1)).toBe(false);
    expect(alphaBetaStable(-0.1, 0.1)).toBe(false);
  });

  it('steady-state lag under constant acceleration: a·T²/β predicted, (1 − α)·a·T²/β updated (Brookner 1998, ch. 1)', () => {
    // α = 0.75, β = 0.5, T = 1, a = 1 → 2.0 and 0.5 (Brookner 1998, ch. 1, steady-state lag a·T²/β; recomputed by simulation).
    const f = new AlphaBetaFilter(m(0, 0), 0.75, 0.5);
    let lagPred = NaN;
    let lagUpd = NaN;
    for (let k = 1; k <= 300; k++) {
      const truth = 0.5 * k * k;
      f.predict(k);
      lagPred = truth - f.estimate().x;
      f.update(m(k, truth));
      lagUpd = truth - f.estimate().x;
    }
    expect(lagPred).toBeCloseTo(2, 6);
    expect(lagUpd).toBeCloseTo(0.5, 6);
  });

  it('gates with the steady-state covariance its gains imply: P⁻ = R·α/(1 − α)', () => {
    // From K = P⁻/(P⁻ + R) = α (Bar-Shalom et al. 2001, §6.5): α = 0.75, R = 1 → P⁻ = 3.
    const f = new AlphaBetaFilter(m(0, 0), 0.75, 0.5);
    f.predict(1);
    f.update(m(1, 0));
    expect(f.peek(2).pxx).toBeCloseTo(3, 12);
    expect(f.gate(m(2, 2)).d2).toBeCloseTo(4 / (3 + 1), 12);
  });
});
