import { describe, expect, it } from 'vitest';
import { errorBandHalfWidthM } from '../../web/src/plan/path-window.ts';

describe('error band around the commanded path', () => {
  it('is twice the running RMSE, to the centimetre, and absent before a figure exists', () => {
    // ±2σ covers about 95 % of a Gaussian error (common practice).
    expect(errorBandHalfWidthM(0.0431)).toBe(0.09);
    expect(errorBandHalfWidthM(0.001)).toBe(0.01);
    expect(errorBandHalfWidthM(null)).toBe(0);
    expect(errorBandHalfWidthM(Number.NaN)).toBe(0);
  });
});
