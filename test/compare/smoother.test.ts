// CV model with continuous white-noise acceleration: Bar-Shalom, Li & Kirubarajan, "Estimation
// with Applications to Tracking and Navigation", 2001, §6.2.2.
// Smoother: Rauch, Tung & Striebel, AIAA Journal 3(8):1445–1450, 1965.
import { describe, expect, it } from 'vitest';
import { cvModel, smoothTrack } from '../../bridge/compare/smoother.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { benchRun, gauss, prng } from './bench-run.ts';

const rms = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length);

describe('cvModel', () => {
  it('CWNA process noise, T = 0.1, q̃ = 1 → [[3.3333e-4, 0.005], [0.005, 0.1]] per axis', () => {
    const { F, Q } = cvModel(0.1, 1);
    expect(Q[0][0]).toBeCloseTo(3.3333e-4, 8);
    expect(Q[0][2]).toBeCloseTo(0.005, 12);
    expect(Q[2][2]).toBeCloseTo(0.1, 12);
    expect(Q[0][1]).toBe(0); // axes independent
    expect(F[0][2]).toBe(0.1);
  });
});

/** Random-acceleration truth drawn from the model itself, measured with isotropic noise. */
function modelRun(seed: number, n: number, T: number, q: number, sigma: number): { rows: TrackRow[]; truth: { x: number; y: number }[] } {
  const rand = prng(seed);
  // Cholesky factor of q̃·[[T³/3, T²/2], [T²/2, T]].
  const l11 = Math.sqrt((q * T ** 3) / 3);
  const l21 = (q * T ** 2) / 2 / l11;
  const l22 = Math.sqrt(q * T - l21 * l21);
  const s = [0, 2, 0.2, 0.1]; // x, y, vx, vy
  const rows: TrackRow[] = [];
  const truth: { x: number; y: number }[] = [];
  for (let k = 0; k < n; k++) {
    if (k > 0) {
      for (const [p, v] of [[0, 2], [1, 3]]) {
        const a = gauss(rand);
        const b = gauss(rand);
        s[p] += T * s[v] + l11 * a;
        s[v] += l21 * a + l22 * b;
      }
    }
    truth.push({ x: s[0], y: s[1] });
    const mx = s[0] + sigma * gauss(rand);
    const my = s[1] + sigma * gauss(rand);
    rows.push({ timeS: k * T, id: 1, status: 'confirmed', x: mx, y: my, vx: 0, vy: 0, speed: 0, headingRad: 0, meas: { x: mx, y: my, sxx: sigma ** 2, sxy: 0, syy: sigma ** 2 } });
  }
  return { rows, truth };
}

describe('smoothTrack', () => {
  it('on a model-matched run, the error ratio matches the one its covariances predict', () => {
    // Consistency check in the sense of Bar-Shalom et al. 2001 §5.4: the achieved error of the
    // filter and of the smoother should match their own covariances; so should their ratio.
    const T = 0.25, q = 0.05, sigma = 0.04;
    const { rows, truth } = modelRun(7, 2000, T, q, sigma);
    const r = smoothTrack(rows, { accelPsd: q })!;
    const skip = 20; // leave out the start-up of the filter
    const ef: number[] = [], es: number[] = [];
    let pf = 0, ps = 0;
    for (let k = skip; k < rows.length; k++) {
      ef.push(Math.hypot(r.filtered[k].x - truth[k].x, r.filtered[k].y - truth[k].y));
      es.push(Math.hypot(r.smoothed[k].x - truth[k].x, r.smoothed[k].y - truth[k].y));
      pf += r.filtered[k].pxx + r.filtered[k].pyy;
      ps += r.smoothed[k].pxx + r.smoothed[k].pyy;
    }
    const predicted = Math.sqrt(ps / pf);
    const achieved = rms(es) / rms(ef);
    expect(predicted).toBeLessThan(0.8); // hindsight must help at all for this test to mean anything
    expect(Math.abs(achieved / predicted - 1)).toBeLessThan(0.1);
    // Each against its own covariance: RMS position error² ≈ mean trace(P), within 10 %.
    expect(rms(ef) ** 2 / (pf / ef.length)).toBeGreaterThan(0.9);
    expect(rms(ef) ** 2 / (pf / ef.length)).toBeLessThan(1.1);
  });

  it('on a manoeuvring bench run, smoothing cuts the tracker\'s position error by at least a quarter', () => {
    // Square path with 90° corners at 0.4 m/s, 4 scans/s, σr = 3 cm, σaz = 1°; the stand-in tracker
    // is a CV filter (bench-run.ts). Why 0.75: for this update rate, noise and q̃ the smoother's
    // own steady-state covariance predicts an RMSE ratio of about 0.65 (computed below); the corners add filter lag that the smoother removes, the
    // model mismatch at the corners costs the smoother some, so 0.65 ± 0.1 is expected and 0.75 is
    // the ceiling asserted. The "typically halves" needs larger manoeuvres relative to noise.
    const path = waypointsToPath([
      { x: -1, y: 2, dwellS: 1 }, { x: 1, y: 2, speedMps: 0.4 }, { x: 1, y: 4, speedMps: 0.4 },
      { x: -1, y: 4, speedMps: 0.4 }, { x: -1, y: 2, speedMps: 0.4, dwellS: 1 },
    ]);
    const ratios: number[] = [];
    for (const seed of [1, 2, 3, 4, 5]) {
      const run = benchRun(path, { seed, trackerQ: 0.05 });
      const rows = run.rows.filter((r) => r.status !== 'tentative');
      const sm = smoothTrack(rows)!;
      const ef: number[] = [], es: number[] = [];
      sm.smoothed.forEach((s, k) => {
        const row = rows[sm.offset + k];
        const t = run.truth(row.timeS);
        ef.push(Math.hypot(row.x - t.x, row.y - t.y));
        es.push(Math.hypot(s.x - t.x, s.y - t.y));
      });
      ratios.push(rms(es) / rms(ef));
    }
    const mean = ratios.reduce((a, b) => a + b, 0) / ratios.length;
    // Covariance-predicted ratio mid-run for T = 0.25 s, q̃ = 0.05, σ ≈ 4 cm (cross-range 1° at ~2.5 m
    // combined with 3 cm in range): noise only, no manoeuvre.
    const still = modelRun(1, 200, 0.25, 0.05, 0.04).rows;
    const cov = smoothTrack(still)!;
    const predicted = Math.sqrt((cov.smoothed[100].pxx + cov.smoothed[100].pyy) / (cov.filtered[100].pxx + cov.filtered[100].pyy));
    expect(Math.abs(mean - predicted)).toBeLessThan(0.1);
    expect(mean).toBeLessThan(0.75);
    expect(Math.max(...ratios)).toBeLessThan(0.8);
    expect(mean).toBeGreaterThan(0.5); // far better would mean the comparison itself is broken
  });

  it('returns null when the rows carry no measurements', () => {
    expect(smoothTrack([{ timeS: 0, id: 1, status: 'confirmed', x: 0, y: 1, vx: 0, vy: 0, speed: 0, headingRad: 0 }])).toBeNull();
  });
});
