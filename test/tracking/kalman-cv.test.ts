import { describe, expect, it } from 'vitest';
import kf from 'kalman-filter';
import { KalmanCv } from '../../bridge/tracking/kalman-cv.ts';
import { kalataGains } from '../../bridge/tracking/alpha-beta.ts';
import { dwnaCv } from '../../bridge/tracking/process-noise.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import quantile from '@stdlib/stats-base-dists-chisquare-quantile';
import type { Measurement } from '../../bridge/types.ts';

const meas = (timeS: number, x: number, y: number, r = 1, rxy = 0): Measurement => ({ timeS, x, y, rxx: r, rxy, ryy: r });

describe('KalmanCv', () => {
  it('converges to the α-β filter of the same tracking index, with the published covariances', () => {
    // Bar-Shalom, Li & Kirubarajan 2001, §6.5: steady-state gain of DWNA CV is [α, β/T] of
    // Kalata's α-β; with R = 1, T = 1, λ = 1: predicted P = [[3,2],[2,2]], updated [[0.75,0.5],[0.5,1]].
    const f = new KalmanCv(meas(0, 0, 0), { model: 'dwna', sigmaAccel: 1, sigmaVel0: 10 });
    for (let k = 1; k <= 200; k++) {
      f.predict(k);
      if (k === 200) {
        expect(f.P[0]).toBeCloseTo(3, 9);
        expect(f.P[1]).toBeCloseTo(2, 9);
        expect(f.P[5]).toBeCloseTo(2, 9);
      }
      f.update(meas(k, 0, 0));
    }
    expect(f.P[0]).toBeCloseTo(0.75, 9);
    expect(f.P[1]).toBeCloseTo(0.5, 9);
    expect(f.P[5]).toBeCloseTo(1, 9);
    // Gain K = P⁻Hᵀ/S with S = P⁻ + R: position 3/4 = α, velocity 2/4 = β/T (Kalata 1984 λ = 1).
    const g = kalataGains(1);
    expect(3 / 4).toBeCloseTo(g.alpha, 12);
    expect(2 / 4).toBeCloseTo(g.beta, 12);
  });

  it('matches npm kalman-filter on the same model and inputs (tolerance 1e-9 absolute)', () => {
    // Outside reference: the generic linear KF of `kalman-filter`, fed our F, Q, H, R and P0.
    const dt = 0.5;
    const sa = 0.3;
    const [q00, q01, , q11] = dwnaCv(dt, sa * sa);
    const F = [[1, dt, 0, 0], [0, 1, 0, 0], [0, 0, 1, dt], [0, 0, 0, 1]];
    const Q = [[q00, q01, 0, 0], [q01, q11, 0, 0], [0, 0, q00, q01], [0, 0, q01, q11]];
    const R = [[0.01, 0.002], [0.002, 0.02]];
    const m0 = { timeS: 0, x: 1, y: 2, rxx: R[0][0], rxy: R[0][1], ryy: R[1][1] };
    const ours = new KalmanCv(m0, { model: 'dwna', sigmaAccel: sa, sigmaVel0: 0.5 });
    const ref = new kf.KalmanFilter({
      observation: { dimension: 2, stateProjection: [[1, 0, 0, 0], [0, 0, 1, 0]], covariance: R },
      dynamic: {
        dimension: 4,
        transition: F,
        covariance: Q,
        init: { mean: [[1], [0], [2], [0]], covariance: [[0.01, 0, 0.002, 0], [0, 0.25, 0, 0], [0.002, 0, 0.02, 0], [0, 0, 0, 0.25]] },
      },
    });
    const rng = createRng(5);
    let prev: InstanceType<typeof kf.State> | undefined;
    for (let k = 1; k <= 30; k++) {
      const t = k * dt;
      const z = [1 + 0.3 * t + rng.normal() * 0.1, 2 - 0.1 * t + rng.normal() * 0.14];
      const pred = ref.predict(prev ? { previousCorrected: prev } : {});
      prev = ref.correct({ predicted: pred, observation: z });
      ours.predict(t);
      ours.update({ timeS: t, x: z[0], y: z[1], rxx: R[0][0], rxy: R[0][1], ryy: R[1][1] });
      for (let i = 0; i < 4; i++) {
        expect(Math.abs(ours.x[i] - prev.mean[i][0])).toBeLessThan(1e-9);
        for (let j = 0; j < 4; j++) expect(Math.abs(ours.P[i * 4 + j] - prev.covariance[i][j])).toBeLessThan(1e-9);
      }
    }
  });

  it('is consistent: average NEES and NIS over 50 Monte Carlo runs lie in their 95 % χ² intervals', () => {
    // Bar-Shalom et al. 2001, §5.4: N = 50 runs, n = 4 → [χ²_200(0.025)/50, χ²_200(0.975)/50] = [3.2546, 4.8212].
    const lo = quantile(0.025, 200) / 50;
    const hi = quantile(0.975, 200) / 50;
    expect(lo).toBeCloseTo(3.2546, 3);
    expect(hi).toBeCloseTo(4.8212, 3);
    const rng = createRng(11);
    const sa = 0.5;
    const dt = 1;
    const runs: KalmanCv[] = [];
    const truth: number[][] = [];
    for (let r = 0; r < 50; r++) {
      truth.push([0, 0.5, 0, -0.2]);
      // Start from a truthful prior: x0 ~ N(truth, P0).
      runs.push(new KalmanCv(meas(0, rng.normal() * 0.1, rng.normal() * 0.1, 0.01), { model: 'dwna', sigmaAccel: sa, sigmaVel0: 1 }));
      runs[r].x[1] = 0.5 + rng.normal();
      runs[r].x[3] = -0.2 + rng.normal();
    }
    // NIS, n = 2 (measurement dimension): [χ²_100(0.025)/50, χ²_100(0.975)/50] = [1.4844, 2.5912].
    const nlo = quantile(0.025, 100) / 50;
    const nhi = quantile(0.975, 100) / 50;
    expect(nlo).toBeCloseTo(1.4844, 3);
    expect(nhi).toBeCloseTo(2.5912, 3);
    let inside = 0;
    let nisInside = 0;
    const steps = 40;
    for (let k = 1; k <= steps; k++) {
      let nees = 0;
      let nis = 0;
      for (let r = 0; r < 50; r++) {
        const s = truth[r];
        // DWNA truth: a white acceleration per step (Bar-Shalom et al. 2001, §6.3.2).
        const ax = rng.normal() * sa;
        const ay = rng.normal() * sa;
        s[0] += s[1] * dt + 0.5 * ax * dt * dt;
        s[1] += ax * dt;
        s[2] += s[3] * dt + 0.5 * ay * dt * dt;
        s[3] += ay * dt;
        const f = runs[r];
        f.predict(k * dt);
        nis += f.update(meas(k * dt, s[0] + rng.normal() * 0.1, s[2] + rng.normal() * 0.1, 0.01));
        nees += neesOf(f, s);
      }
      if (nees / 50 >= lo && nees / 50 <= hi) inside++;
      if (nis / 50 >= nlo && nis / 50 <= nhi) nisInside++;
    }
    // 95 % intervals: expect about 95 % of the 40 steps inside; allow down to 85 %.
    expect(inside / steps).toBeGreaterThan(0.85);
    expect(nisInside / steps).toBeGreaterThan(0.85);
  });
});

/** (x − x̂)ᵀP⁻¹(x − x̂) by Gauss-Jordan on the 4×4 covariance. */
function neesOf(f: KalmanCv, s: number[]): number {
  const e = [s[0] - f.x[0], s[1] - f.x[1], s[2] - f.x[2], s[3] - f.x[3]];
  const a = Array.from({ length: 4 }, (_, i) => [...Array.from({ length: 4 }, (_, j) => f.P[i * 4 + j]), e[i]]);
  for (let c = 0; c < 4; c++) {
    const p = a[c][c];
    for (let j = c; j < 5; j++) a[c][j] /= p;
    for (let r = 0; r < 4; r++) {
      if (r === c) continue;
      const k = a[r][c];
      for (let j = c; j < 5; j++) a[r][j] -= k * a[c][j];
    }
  }
  return e.reduce((acc, ei, i) => acc + ei * a[i][4], 0);
}
