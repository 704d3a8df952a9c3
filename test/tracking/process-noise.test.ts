import { describe, expect, it } from 'vitest';
import { cwnaCa, cwnaCv, cvProcessNoise, dwnaCv, dwpaCa } from '../../bridge/tracking/process-noise.ts';

describe('process noise (Bar-Shalom, Li & Kirubarajan 2001, §6.2–6.3)', () => {
  it('DWNA CV, T = 0.1, σ² = 1 → [[2.5e-5, 5e-4], [5e-4, 0.01]]', () => {
    const q = dwnaCv(0.1, 1);
    [2.5e-5, 5e-4, 5e-4, 0.01].forEach((v, i) => expect(q[i]).toBeCloseTo(v, 12));
  });

  it('CWNA CV, T = 0.1, q̃ = 1 → [[3.3333e-4, 0.005], [0.005, 0.1]]', () => {
    const q = cwnaCv(0.1, 1);
    [1e-3 / 3, 0.005, 0.005, 0.1].forEach((v, i) => expect(q[i]).toBeCloseTo(v, 12));
    expect(q[0]).toBeCloseTo(3.3333e-4, 8);
  });

  it('DWPA CA: σ²·[[T⁴/4, T³/2, T²/2], [T³/2, T², T], [T²/2, T, 1]]', () => {
    const T = 0.5;
    const q = dwpaCa(T, 2);
    const ref = [T ** 4 / 4, T ** 3 / 2, T ** 2 / 2, T ** 3 / 2, T ** 2, T, T ** 2 / 2, T, 1].map((v) => 2 * v);
    ref.forEach((v, i) => expect(q[i]).toBeCloseTo(v, 12));
  });

  it('CWNA CA: q̃·[[T⁵/20, T⁴/8, T³/6], [T⁴/8, T³/3, T²/2], [T³/6, T²/2, T]]', () => {
    const T = 2;
    const q = cwnaCa(T, 0.5);
    const ref = [32 / 20, 16 / 8, 8 / 6, 16 / 8, 8 / 3, 2, 8 / 6, 2, 2].map((v) => 0.5 * v);
    ref.forEach((v, i) => expect(q[i]).toBeCloseTo(v, 12));
  });

  it('is symmetric and positive semi-definite for any step', () => {
    for (const T of [0.004, 0.5, 2]) {
      for (const q of [cvProcessNoise('dwna', T, 0.3), cvProcessNoise('cwna', T, 0.3)]) {
        expect(q[1]).toBe(q[2]);
        expect(q[0]).toBeGreaterThan(0);
        expect(q[0] * q[3] - q[1] * q[2]).toBeGreaterThanOrEqual(-1e-18);
      }
    }
  });
});
