import { describe, expect, it } from 'vitest';
import {
  azimuthDiff,
  convertLinearised,
  convertUnbiased,
  noiseAtRange,
  resolveMeasurementOptions,
  toMeasurement,
  wrapAzimuth,
} from '../../bridge/tracking/measurement.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import { hasCode } from '../../bridge/errors.ts';
import { lambdaMax } from '../../bridge/tracking/filter-types.ts';

const DEG = Math.PI / 180;

describe('polar → Cartesian conversion', () => {
  // Check values recomputed from the formulas (Bar-Shalom et al. 2001 §10.4.3; Mo et al. 1998):
  // r = 5 m, θ = 30°, σr = 0.05 m, σθ = 2°.
  it('linearised conversion matches Bar-Shalom et al. 2001, §10.4.3', () => {
    const m = convertLinearised(5, 30 * DEG, 0.05, 2 * DEG);
    expect(m.x).toBeCloseTo(4.330127, 6);
    expect(m.y).toBeCloseTo(2.5, 6);
    expect(m.rxx).toBeCloseTo(9.4904e-3, 7);
    expect(m.ryy).toBeCloseTo(2.34713e-2, 7);
    expect(m.rxy).toBeCloseTo(-1.21078e-2, 7);
  });

  it('unbiased conversion matches Mo, Song, Zhou, Sun & Bar-Shalom, IEEE Trans. AES 34(3), 1998', () => {
    const m = convertUnbiased(5, 30 * DEG, 0.05, 2 * DEG);
    expect(m.x).toBeCloseTo(4.332766, 6);
    expect(m.y).toBeCloseTo(2.501524, 6);
    expect(m.rxx).toBeCloseTo(9.5214e-3, 7);
    expect(m.ryy).toBeCloseTo(2.34589e-2, 7);
    expect(m.rxy).toBeCloseTo(-1.20703e-2, 7);
  });

  it('the unbiased conversion has no mean bias where the linearised one has (Monte Carlo)', () => {
    // Mo et al. 1998: E[r cos θ] = λθ·x for Gaussian θ noise, λθ = e^(−σθ²/2). With σθ = 10°,
    // r = 5 m the linearised bias along the line of sight is 5·(1 − λθ) ≈ 7.6 mm.
    const rng = createRng(3);
    const n = 200_000;
    let lin = 0;
    let unb = 0;
    for (let i = 0; i < n; i++) {
      const r = 5 + rng.normal() * 0.05;
      const th = rng.normal() * 10 * DEG;
      lin += convertLinearised(r, th, 0.05, 10 * DEG).x;
      unb += convertUnbiased(r, th, 0.05, 10 * DEG).x;
    }
    expect(5 - lin / n).toBeCloseTo(5 * (1 - Math.exp(-((10 * DEG) ** 2) / 2)), 3);
    expect(Math.abs(unb / n - 5)).toBeLessThan(1.5e-3);
  });

  it('uses azimuth clockwise from +y and applies offsets before converting', () => {
    const o = resolveMeasurementOptions({ conversion: 'linearised', rangeOffsetM: 0.1, azimuthOffsetRad: 2 * DEG });
    const m = toMeasurement({ timeS: 1, azimuthRad: 88 * DEG, rangeM: 1.9, amplitude: 1 }, o);
    // az = 90° → +x axis (project convention x = r·sin(az), y = r·cos(az)).
    expect(m.x).toBeCloseTo(2, 12);
    expect(m.y).toBeCloseTo(0, 12);
    expect(m.timeS).toBe(1);
  });

  it('wraps azimuth at 0/360 everywhere', () => {
    const o = resolveMeasurementOptions({ conversion: 'linearised', azimuthOffsetRad: 3 * DEG });
    const a = toMeasurement({ timeS: 0, azimuthRad: 359 * DEG, rangeM: 2, amplitude: 1 }, o);
    expect(a.x).toBeCloseTo(2 * Math.sin(2 * DEG), 12);
    expect(wrapAzimuth(-1 * DEG)).toBeCloseTo(359 * DEG, 12);
    expect(wrapAzimuth(361 * DEG)).toBeCloseTo(1 * DEG, 12);
    expect(azimuthDiff(1 * DEG, 359 * DEG)).toBeCloseTo(2 * DEG, 12);
    expect(azimuthDiff(359 * DEG, 1 * DEG)).toBeCloseTo(-2 * DEG, 12);
  });

  it('defaults to typical bench noise and refuses non-positive noise', () => {
    // σ_range ≈ 5 cm, σ_azimuth ≈ 1.5°: common practice for nanosecond-pulse bench radars.
    const o = resolveMeasurementOptions();
    expect(o.sigmaRangeM).toBe(0.05);
    expect(o.sigmaAzimuthRad).toBeCloseTo(1.5 * DEG, 12);
    expect(o.conversion).toBe('unbiased');
    let err: unknown;
    try {
      resolveMeasurementOptions({ sigmaRangeM: 0 });
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_OPTION')).toBe(true);
  });
});

describe('noiseAtRange', () => {
  it('is the largest eigenvalue of the converted covariance, whatever the azimuth', () => {
    const o = { conversion: 'unbiased' as const, sigmaRangeM: 0.05, sigmaAzimuthRad: (1.5 * Math.PI) / 180, rangeOffsetM: 0.1, azimuthOffsetRad: 0 };
    for (const conversion of ['unbiased', 'linearised'] as const) {
      for (const az of [0, 0.7, 2, 4.5]) {
        const m = toMeasurement({ timeS: 0, azimuthRad: az, rangeM: 4, amplitude: 1 }, { ...o, conversion });
        expect(noiseAtRange(4, { ...o, conversion })).toBeCloseTo(lambdaMax(m.rxx, m.rxy, m.ryy), 12);
      }
    }
    // Linearised: the eigenvalues are σr² and (r·σθ)² (Bar-Shalom et al. 2001, §10.4.3), r with the offset.
    expect(noiseAtRange(4, { ...o, conversion: 'linearised' })).toBeCloseTo((4.1 * o.sigmaAzimuthRad) ** 2, 12);
  });
});
