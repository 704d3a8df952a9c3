import { describe, expect, it } from 'vitest';
import { estimateNoise } from '../../bridge/tracking/noise-estimate.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection } from '../../bridge/types.ts';

const DEG = Math.PI / 180;

/** Stationary reflectors (incl. a wall of points 0.6 m apart) plus a moving target and clutter. */
function run(sr: number, sa: number, seed: number, revs = 40): Detection[] {
  const rng = createRng(seed);
  const reflectors = [{ r: 0.6, a: 10 * DEG }, { r: 3.5, a: 330 * DEG }, { r: 3.5, a: 30 * DEG }];
  for (let x = -3; x <= 3; x += 0.6) reflectors.push({ r: Math.hypot(x, 7.2), a: (Math.atan2(x, 7.2) + 2 * Math.PI) % (2 * Math.PI) });
  const out: Detection[] = [];
  for (let k = 0; k < revs; k++) {
    const dets: Detection[] = [];
    for (const f of reflectors) {
      if (rng.uniform() < 0.9) dets.push({ timeS: 0, azimuthRad: (f.a + rng.normal() * sa + 2 * Math.PI) % (2 * Math.PI), rangeM: f.r + rng.normal() * sr, amplitude: 5 });
    }
    dets.push({ timeS: 0, azimuthRad: 1, rangeM: 2 + 0.3 * k, amplitude: 5 });
    for (let c = 0; c < 3; c++) dets.push({ timeS: 0, azimuthRad: rng.between(0, 2 * Math.PI), rangeM: rng.between(0.5, 8), amplitude: 2 });
    for (const d of dets) d.timeS = k + d.azimuthRad / (2 * Math.PI);
    out.push(...dets.sort((a, b) => a.timeS - b.timeS));
  }
  return out;
}

describe('noise estimate from stationary reflectors', () => {
  it('recovers σ_range and σ_azimuth within 25 % from 40 revolutions', () => {
    // Scan-to-scan differences of a stationary reflector have σ·√2 (difference of two independent
    // Gaussians: common practice); 1.4826·MAD estimates σ for Gaussian data (common practice).
    // About 100 usable pairs per run: the MAD's relative standard error is ~8 %, so 25 % is 3 SE.
    for (const [sr, sa] of [[0.05, 1.5 * DEG], [0.03, 1 * DEG], [0.08, 2 * DEG]]) {
      const e = estimateNoise(run(sr, sa, 7), 1)!;
      expect(e).not.toBeNull();
      expect(e.sigmaRangeM / sr).toBeGreaterThan(0.75);
      expect(e.sigmaRangeM / sr).toBeLessThan(1.25);
      expect(e.sigmaAzimuthRad / sa).toBeGreaterThan(0.75);
      expect(e.sigmaAzimuthRad / sa).toBeLessThan(1.25);
      expect(e.reflectors).toBeGreaterThanOrEqual(2);
    }
  });

  it('does not take slowly moving targets for stationary reflectors', () => {
    // 40 targets creeping at 2–5 cm per scan, no fixed reflector: their bins fill scan after
    // scan, but the drift gives them away.
    const rng = createRng(5);
    const dets: Detection[] = [];
    for (let k = 0; k < 40; k++) {
      for (let i = 0; i < 40; i++) {
        const r = 1 + i * 0.5 + (0.02 + 0.0008 * i) * k;
        const a = (i * 9 * DEG) % (2 * Math.PI);
        dets.push({ timeS: k + a / (2 * Math.PI), azimuthRad: (a + rng.normal() * 1.5 * DEG + 2 * Math.PI) % (2 * Math.PI), rangeM: r + rng.normal() * 0.05, amplitude: 3 });
      }
    }
    dets.sort((x, y) => x.timeS - y.timeS);
    const e = estimateNoise(dets, 1);
    expect(e === null || e.samples < 40 || e.sigmaRangeM < 0.065).toBe(true);
  });

  it('gives no estimate without stationary reflectors or with too short a run', () => {
    const moving: Detection[] = Array.from({ length: 20 }, (_, k) => ({ timeS: k, azimuthRad: 1, rangeM: 1 + 0.4 * k, amplitude: 1 }));
    expect(estimateNoise(moving, 1)).toBeNull();
    expect(estimateNoise(run(0.05, 1.5 * DEG, 1, 3), 1)).toBeNull();
  });
});
