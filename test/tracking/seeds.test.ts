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

  it('finds a seed two cells away when the noise widens the reach past the cell size', () => {
    // Cells are maxSpeed·life + 0.3 m = 4.05 m. Far out, cross-range σ is large (here 0.5 m in
    // both detections): the reach 1.5·2.4 + 3·√(0.25 + 0.25) = 5.72 m spans more than a cell, and
    // 5.5 m from x = 3.9 (cell 0) lands in cell 2, outside the 3×3 block a look-up once read.
    const wide = (timeS: number, x: number): Measurement => ({ timeS, x, y: 40, rxx: 0.25, rxy: 0, ryy: 0.25 });
    const p = new SeedPool(1.5, 2.5);
    p.add(wide(0, 3.9), d(0));
    expect(p.take(wide(2.4, 3.9 + 5.5))?.m.x).toBe(3.9);
  });
});
