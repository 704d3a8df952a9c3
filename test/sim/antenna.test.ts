import { describe, expect, it } from 'vitest';
import { beamAzimuth, beamCrossings, inSector, staringLooks } from '../../bridge/sim/antenna.ts';
import { wrapPi } from '../../bridge/sim/measure.ts';
import { resolveScenarioOptions } from '../../bridge/sim/scenario.ts';

describe('rotating antenna', () => {
  it('crosses a fixed azimuth once per revolution at (az − az0)/(2π)·T + kT', () => {
    const T = 0.8;
    const az0 = 0.3;
    const az = 2.0;
    const ts = beamCrossings(T, az0, 0, 10 * T, () => az);
    expect(ts).toHaveLength(10);
    ts.forEach((t, k) => expect(t).toBeCloseTo(((az - az0) / (2 * Math.PI)) * T + k * T, 9));
  });

  it('adjacent windows never report a crossing twice nor miss one', () => {
    const az = (t: number) => 0.5 + 0.2 * t; // slowly moving clockwise target
    const whole = beamCrossings(1, 0, 0, 20, az);
    const parts = [];
    for (let k = 0; k < 20; k++) parts.push(...beamCrossings(1, 0, k, k + 1, az));
    expect(parts.length).toBe(whole.length);
    parts.forEach((t, i) => expect(t).toBeCloseTo(whole[i], 9));
  });

  it('a moving target is detected where the beam points at it', () => {
    const az = (t: number) => 6.2 - 0.4 * t; // counter-clockwise through 0
    for (const t of beamCrossings(1, 0, 0, 15, az)) expect(Math.abs(wrapPi(beamAzimuth(1, 0, t) - az(t)))).toBeLessThan(1e-7);
    // relative beam rate 2π + 0.4 rad/s: 15 s give ⌊15·(2π+0.4)/2π⌋ or one more crossing
    const n = beamCrossings(1, 0, 0, 15, az).length;
    expect(n === 15 || n === 16).toBe(true);
  });
});

describe('staring antenna', () => {
  it('looks at multiples of 1/rate in (t0, t1]', () => {
    expect(staringLooks(4, 0, 1)).toEqual([0.25, 0.5, 0.75, 1]);
    expect(staringLooks(4, 1, 1.5)).toEqual([1.25, 1.5]);
  });

  it('covers only its sector', () => {
    const ant = resolveScenarioOptions({ antenna: { mode: 'staring', centerAzimuthDeg: 350, sectorDeg: 40 } }).antenna;
    expect(inSector(ant, (5 * Math.PI) / 180)).toBe(true);
    expect(inSector(ant, (20 * Math.PI) / 180)).toBe(false);
  });
});
