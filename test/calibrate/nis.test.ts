import { describe, expect, it } from 'vitest';
import { describeNis, nisBounds, nisStats } from '../../bridge/calibrate/nis.ts';
import { runNis } from '../../bridge/calibrate/noise-tuning.ts';
import { resolveFilterOptions } from '../../bridge/tracking/filter.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection } from '../../bridge/types.ts';

describe('NIS bounds', () => {
  it('match the published χ² bounds', () => {
    // Bar-Shalom, Li & Kirubarajan 2001, §5.4: 95% two-sided interval [χ²_{nN}(0.025)/N, χ²_{nN}(0.975)/N];
    // n = 2, N = 50 → [1.4844, 2.5912]; n = 4, N = 50 → [3.2546, 4.8212] (Bar-Shalom, Li & Kirubarajan 2001, §5.4: χ²_{nN}(0.025)/N, χ²_{nN}(0.975)/N).
    const b2 = nisBounds(50, 2);
    expect(b2.lower).toBeCloseTo(1.4844, 4);
    expect(b2.upper).toBeCloseTo(2.5912, 4);
    const b4 = nisBounds(50, 4);
    expect(b4.lower).toBeCloseTo(3.2546, 4);
    expect(b4.upper).toBeCloseTo(4.8212, 4);
  });

  it('single-update 95% quantile for 2 dof is 5.9915 (NIST/SEMATECH table; = −2 ln 0.05)', () => {
    const s = nisStats([1, 2, 3]);
    expect(s.single95).toBeCloseTo(5.9915, 4);
    expect(s.single95).toBeCloseTo(-2 * Math.log(0.05), 10);
  });

  it('verdicts follow the bounds', () => {
    expect(nisStats(new Array(50).fill(2)).verdict).toBe('consistent');
    expect(nisStats(new Array(50).fill(3)).verdict).toBe('over-confident');
    expect(nisStats(new Array(50).fill(1)).verdict).toBe('under-confident');
    expect(describeNis(nisStats(new Array(50).fill(3)))).toMatch(/over-confident.*raise/);
  });

  it('a correctly specified Kalman filter on matching data is consistent', () => {
    // Truth: constant velocity with discrete white-noise acceleration σ_a = 0.05 m/s², T = 0.1 s
    // (a staring antenna); with this seed it wanders between 4.5 and 6 m, where r·σ_az² is far
    // below σ_r so the converted measurement is unbiased. Measurements: σ_r = 0.05 m,
    // σ_az = 1°. The filter gets the same figures, so its time-averaged NIS must fall inside the
    // 95% bounds (Bar-Shalom 2001 §5.4).
    const rng = createRng(14);
    const dets: Detection[] = [];
    const T = 0.1;
    let x = 0, y = 6, vx = 0, vy = 0;
    for (let k = 0; k < 600; k++) {
      const ax = rng.normal(0, 0.05), ay = rng.normal(0, 0.05);
      x += vx * T + 0.5 * ax * T * T; y += vy * T + 0.5 * ay * T * T; vx += ax * T; vy += ay * T;
      const r = Math.hypot(x, y) + rng.normal(0, 0.05);
      const az = Math.atan2(x, y) + rng.normal(0, Math.PI / 180);
      dets.push({ timeS: (k + 1) * T, rangeM: r, azimuthRad: (az + 2 * Math.PI) % (2 * Math.PI), amplitude: 1 });
    }
    const filter = resolveFilterOptions({ kind: 'kalman', sigmaAccel: 0.05 });
    const s = nisStats(runNis(dets, filter, 0.05, Math.PI / 180, 5, 5));
    expect(s.count).toBeGreaterThan(500);
    expect(s.verdict).toBe('consistent');
    // and a filter told the noise is a quarter of what it is, is over-confident
    expect(nisStats(runNis(dets, filter, 0.0125, Math.PI / 720, 5, 5)).verdict).toBe('over-confident');
  });
});
