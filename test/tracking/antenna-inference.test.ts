import { describe, expect, it } from 'vitest';
import { inferAntenna } from '../../bridge/tracking/antenna-inference.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection } from '../../bridge/types.ts';

/** Reflectors at fixed azimuths seen once per revolution, P_D 0.8, the beam starting at az0. */
function rotating(periodS: number, revs: number, azs: number[], seed = 1): Detection[] {
  const rng = createRng(seed);
  const out: Detection[] = [];
  for (let k = 0; k < revs; k++) {
    for (const az of [...azs].sort((a, b) => a - b)) {
      if (rng.uniform() < 0.8) out.push({ timeS: (k + az / (2 * Math.PI)) * periodS, azimuthRad: az, rangeM: 3, amplitude: 1 });
    }
  }
  return out;
}

describe('antenna inference from azimuth wrap-around', () => {
  it('finds a rotating antenna and its period', () => {
    for (const P of [0.5, 1, 2]) {
      const a = inferAntenna(rotating(P, 10, [0.3, 1.5, 2.2, 4, 5.9]));
      expect(a.kind).toBe('rotating');
      expect(a.periodS).toBeCloseTo(P, 6);
      expect(a.wraps).toBeGreaterThanOrEqual(8);
      expect(a.forwardFraction).toBeGreaterThan(0.9);
    }
  });

  it('a dense scan whose azimuth noise crosses 0° back and forth still counts one wrap per revolution', () => {
    // 800 reflectors all round, 1.5° azimuth noise: near 0° consecutive detections straddle the
    // zero reference in both directions.
    const rng = createRng(4);
    const azs = Array.from({ length: 800 }, () => rng.uniform() * 2 * Math.PI).sort((a, b) => a - b);
    const d: Detection[] = [];
    for (let k = 0; k < 15; k++) {
      for (const az of azs) {
        const noisy = (((az + rng.normal() * 0.026) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
        d.push({ timeS: k + az / (2 * Math.PI), azimuthRad: noisy, rangeM: 20, amplitude: 1 });
      }
    }
    const a = inferAntenna(d);
    expect(a.kind).toBe('rotating');
    // One wrap per crossing of 0° (a rare chain longer than 50 ms may count twice), not one per straddle.
    expect(a.wraps).toBeLessThanOrEqual(16);
    expect(a.periodS).toBeCloseTo(1, 3);
  });

  it('bridges revolutions without any detection', () => {
    const d = rotating(1, 12, [1, 3]).filter((x) => x.timeS < 4 || x.timeS > 7);
    expect(inferAntenna(d).periodS).toBeCloseTo(1, 6);
  });

  it('finds a staring antenna and the per-target update interval', () => {
    const rng = createRng(2);
    const d: Detection[] = [];
    for (let k = 0; k < 1000; k++) {
      const t = k / 200;
      d.push({ timeS: t, azimuthRad: 0.1 + rng.normal() * 0.02, rangeM: 2 + 0.1 * t, amplitude: 1 });
      d.push({ timeS: t + 1e-4, azimuthRad: 6.2 + rng.normal() * 0.02, rangeM: 4, amplitude: 1 });
    }
    const a = inferAntenna(d);
    expect(a.kind).toBe('staring');
    expect(a.intervalS).toBeCloseTo(1 / 200, 6);
  });

  it('one reflector on a rotating antenna: no wraps to see, still scan-like at its interval', () => {
    const a = inferAntenna(rotating(1.5, 10, [2]));
    expect(a.kind).toBe('rotating');
    expect(a.intervalS).toBeCloseTo(1.5, 1);
  });
});
