// Fixed-interval smoother: Rauch, Tung & Striebel, "Maximum likelihood estimates of linear dynamic
// systems", AIAA Journal 3(8):1445–1450, 1965; notation of Bar-Shalom, Li & Kirubarajan,
// "Estimation with Applications to Tracking and Navigation", 2001, §8.6.
import kf from 'kalman-filter';
import { describe, expect, it } from 'vitest';
import { add, col, inverse, mul, transpose, zeros } from '../../bridge/compare/matrix.ts';
import { filterAndSmooth } from '../../bridge/compare/rts.ts';
import { cvModel } from '../../bridge/compare/smoother.ts';

describe('filterAndSmooth, scalar random walk worked by hand', () => {
  // x_k = x_{k−1} + w, Q = 1; z_k = x_k + v, R = 1; prior at step 1: x = 0, P = 1; z = (1, 3).
  // Filter: K1 = 1/2 → x1|1 = 0.5, P1|1 = 0.5; P2|1 = 1.5, K2 = 0.6 → x2|2 = 2.0, P2|2 = 0.6.
  // Smoother: C1 = 0.5/1.5 = 1/3 → x1|2 = 0.5 + (2.0 − 0.5)/3 = 1.0; P1|2 = 0.5 + (0.6 − 1.5)/9 = 0.4.
  // Independent check, batch: information matrix [[3, −1], [−1, 2]], vector (1, 3) →
  // mean (1, 2), covariance diag (2/5, 3/5), the same numbers.
  const step = { F: [[1]], Q: [[1]], H: [[1]], R: [[1]] };
  const r = filterAndSmooth([[0]], [[1]], [{ ...step, z: [[1]] }, { ...step, z: [[3]] }]);

  it('filters as worked', () => {
    expect(r.filtered[0].x[0][0]).toBeCloseTo(0.5, 12);
    expect(r.filtered[0].P[0][0]).toBeCloseTo(0.5, 12);
    expect(r.filtered[1].x[0][0]).toBeCloseTo(2.0, 12);
    expect(r.filtered[1].P[0][0]).toBeCloseTo(0.6, 12);
  });

  it('smooths to the batch posterior', () => {
    const info = [[3, -1], [-1, 2]];
    const cov = inverse(info);
    const mean = mul(cov, col(1, 3));
    expect(r.smoothed[0].x[0][0]).toBeCloseTo(mean[0][0], 12);
    expect(r.smoothed[1].x[0][0]).toBeCloseTo(mean[1][0], 12);
    expect(r.smoothed[0].P[0][0]).toBeCloseTo(cov[0][0], 12);
    expect(r.smoothed[0].P[0][0]).toBeCloseTo(0.4, 12);
  });

  it('runs through a step without a measurement', () => {
    const gap = filterAndSmooth([[0]], [[1]], [{ ...step, z: [[1]] }, { F: [[1]], Q: [[1]] }, { ...step, z: [[3]] }]);
    // The coast only predicts: P2|2 = 0.5 + 1.
    expect(gap.filtered[1].P[0][0]).toBeCloseTo(1.5, 12);
    // Smoothed middle lies between its neighbours' smoothed values.
    const [a, b, c] = gap.smoothed.map((s) => s.x[0][0]);
    expect(b).toBeGreaterThan(a);
    expect(b).toBeLessThan(c);
  });
});

describe('filterAndSmooth, constant velocity without process noise', () => {
  it('recovers a noise-free straight line exactly, velocity included, from a vague prior', () => {
    // With Q = 0 the smoother equals the batch least-squares line fit (Bar-Shalom et al. 2001,
    // §8.6); points exactly on a line fit exactly, up to the prior's weight (1e-8 relative here).
    const T = 0.25;
    const truth = (k: number) => ({ x: 1 + 0.3 * k * T, y: 2 - 0.2 * k * T });
    const steps = Array.from({ length: 40 }, (_, k) => {
      const { F, Q } = cvModel(k === 0 ? 0 : T, 0);
      const p = truth(k);
      return { F, Q, z: col(p.x, p.y), H: [[1, 0, 0, 0], [0, 1, 0, 0]], R: [[0.01, 0.002], [0.002, 0.02]] };
    });
    const P0 = zeros(4, 4);
    P0[0][0] = P0[1][1] = P0[2][2] = P0[3][3] = 1e6;
    const r = filterAndSmooth(col(0, 0, 0, 0), P0, steps);
    r.smoothed.forEach((s, k) => {
      expect(s.x[0][0]).toBeCloseTo(truth(k).x, 6);
      expect(s.x[1][0]).toBeCloseTo(truth(k).y, 6);
      expect(s.x[2][0]).toBeCloseTo(0.3, 6);
      expect(s.x[3][0]).toBeCloseTo(-0.2, 6);
    });
    // The filter alone knows nothing of the velocity after one measurement; the smoother does.
    expect(Math.abs(r.filtered[0].x[2][0] - 0.3)).toBeGreaterThan(0.1);
  });
});

describe('filterAndSmooth forward pass against an outside implementation', () => {
  it('matches npm kalman-filter on a 1-D constant-velocity case', () => {
    // kalman-filter predicts from its `init` before the first correction, so our prior (the
    // predicted state at step 1) is F·init, F·P·Fᵀ + Q.
    const F = [[1, 0.5], [0, 1]];
    const Q = [[0.01, 0.02], [0.02, 0.08]];
    const R = [[0.04]];
    const H = [[1, 0]];
    const init = { mean: [[0], [0]], covariance: [[100, 0], [0, 1]] };
    const obs = [0.1, 0.35, 0.52, 0.8, 1.05, 1.21, 1.55];
    const ref = new kf.KalmanFilter({
      observation: { dimension: 1, stateProjection: H, covariance: R },
      dynamic: { dimension: 2, transition: F, covariance: Q, init },
    }).filterAll(obs.map((z) => [z]));
    const x0 = mul(F, init.mean);
    const P0 = add(mul(mul(F, init.covariance), transpose(F)), Q);
    const mine = filterAndSmooth(x0, P0, obs.map((z) => ({ F, Q, H, R, z: [[z]] })));
    mine.filtered.forEach((f, k) => {
      expect(f.x[0][0]).toBeCloseTo(ref[k][0], 9);
      expect(f.x[1][0]).toBeCloseTo(ref[k][1], 9);
    });
  });
});
