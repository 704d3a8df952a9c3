import { describe, expect, it } from 'vitest';
import { resolveScenarioOptions } from '../../bridge/sim/scenario.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('resolveScenarioOptions', () => {
  it('fills the defaults and converts degrees to radians', () => {
    const sc = resolveScenarioOptions({ sigmaAzimuthDeg: 2, azimuthOffsetDeg: 90, antenna: { mode: 'rotating', startAzimuthDeg: 180 } });
    expect(sc.sigmaAzimuthRad).toBeCloseTo((2 * Math.PI) / 180, 15);
    expect(sc.azimuthOffsetRad).toBeCloseTo(Math.PI / 2, 15);
    expect(sc.antenna).toEqual({ mode: 'rotating', periodS: 1, startAzimuthRad: Math.PI });
    // Defaults typical of a nanosecond bench radar (issue 2: σ_range ≈ 5 cm, σ_azimuth ≈ 1.5°; common practice)
    expect(sc.sigmaRangeM).toBe(0.05);
    expect(resolveScenarioOptions({}).sigmaAzimuthRad).toBeCloseTo((1.5 * Math.PI) / 180, 15);
    expect(resolveScenarioOptions({}).durationS).toBe(60);
  });

  it('expands a wall into a row of reflectors at the given spacing', () => {
    const sc = resolveScenarioOptions({ walls: [{ from: { x: -3, y: 7 }, to: { x: 3, y: 7 }, spacingM: 1 }] });
    expect(sc.fixedEchoes).toHaveLength(7);
    expect(sc.fixedEchoes[3]).toMatchObject({ x: 0, y: 7, label: 'wall 1' });
  });

  it('refuses impossible values with E_OPTION', () => {
    for (const bad of [{ pd: 1.5 }, { durationS: -1 }, { minRangeM: 9, maxRangeM: 8 }, { antenna: { mode: 'rotating' as const, periodS: 0 } }]) {
      let err: unknown;
      try {
        resolveScenarioOptions(bad);
      } catch (e) {
        err = e;
      }
      expect(hasCode(err, 'E_OPTION')).toBe(true);
    }
  });
});
