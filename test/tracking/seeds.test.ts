import { describe, expect, it } from 'vitest';
import { SeedPool } from '../../bridge/tracking/seeds.ts';
import type { Detection, Measurement } from '../../bridge/types.ts';

const m = (timeS: number, x: number, y: number): Measurement => ({ timeS, x, y, rxx: 0.0025, rxy: 0, ryy: 0.0025 });
const d = (timeS: number): Detection => ({ timeS, azimuthRad: 0, rangeM: 1, amplitude: 1 });

describe('seed pool (two-point initiation)', () => {
  it('pairs a later detection within maxSpeed·Δt + 3σ with the nearest seed, once', () => {
    const p = new SeedPool(1, 2.5);
    p.add(m(0, 0, 5), d(0));
    p.add(m(0, 0.8, 5), d(0));
    const s = p.take(m(1, 0.6, 5));
    expect(s?.m.x).toBe(0.8); // the nearer one
    expect(p.take(m(1, 0.8, 5))?.m.x).toBe(0); // 0.8 m in 1 s at 1 m/s (+3σ) still in reach
    expect(p.take(m(1, 0.8, 5))).toBeNull(); // both used
  });

  it('does not pair beyond the reach or after the seed life', () => {
    const p = new SeedPool(1, 2.5);
    p.add(m(0, 0, 5), d(0));
    // 1 m/s for 1 s plus 3σ (σ = √(2·0.0025) ≈ 0.07 m): 1.3 m is out of reach.
    expect(p.take(m(1, 1.3, 5))).toBeNull();
    expect(p.take(m(3, 0.1, 5))).toBeNull(); // expired after 2.5 s
    expect(p.size).toBe(0);
  });
});
