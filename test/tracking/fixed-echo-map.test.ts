import { describe, expect, it } from 'vitest';
import { FixedEchoMap, resolveFixedEchoOptions } from '../../bridge/tracking/fixed-echo-map.ts';
import { gateThreshold } from '../../bridge/tracking/gate.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection, Measurement } from '../../bridge/types.ts';

const R = 0.0025;
const meas = (t: number, x: number, y: number): Measurement => ({ timeS: t, x, y, rxx: R, rxy: 0, ryy: R });
const det = (t: number): Detection => ({ timeS: t, azimuthRad: 0, rangeM: 1, amplitude: 10 });

describe('fixed-echo map', () => {
  it('learns a reflector seen in most scans for afterS, not before', () => {
    const rng = createRng(1);
    const map = new FixedEchoMap(gateThreshold(0.99), 1, 10, false);
    let fixedAt = NaN;
    for (let k = 0; k < 20; k++) {
      if (rng.uniform() > 0.9) continue; // P_D 0.9
      const t = k + 0.3;
      const isEcho = map.learn(meas(t, 1 + rng.normal() * 0.05, 3 + rng.normal() * 0.05), det(t));
      if (isEcho && Number.isNaN(fixedAt)) fixedAt = t;
    }
    expect(fixedAt).toBeGreaterThanOrEqual(10);
    expect(fixedAt).toBeLessThan(13);
    const list = map.list();
    expect(list).toHaveLength(1);
    expect(list[0].x).toBeCloseTo(1, 1);
    expect(list[0].rangeM).toBeCloseTo(Math.hypot(1, 3), 1);
    expect(map.match(meas(21, 1.02, 3))).toBeLessThan(Infinity);
    expect(map.match(meas(21, 1.5, 3))).toBe(Infinity);
  });

  it('never learns scattered clutter, and forgets faded candidates (bounded memory)', () => {
    const rng = createRng(2);
    const map = new FixedEchoMap(gateThreshold(0.99), 1, 10, false);
    for (let k = 0; k < 200; k++) {
      for (let c = 0; c < 20; c++) map.learn(meas(k + c / 20, rng.between(-10, 10), rng.between(0, 10)), det(k));
      map.expire(k + 1, 60);
    }
    expect(map.size).toBe(0);
    expect(map.candidates).toBeLessThan(400);
  });

  it('an echo unseen for a while stops blanking (vacated) and is forgotten after forgetS', () => {
    const map = new FixedEchoMap(gateThreshold(0.99), 1, 5, false);
    for (let k = 0; k < 10; k++) map.learn(meas(k, 2, 2), det(k));
    expect(map.match(meas(10, 2, 2))).toBeLessThan(Infinity);
    // Gone from t = 10 (a parked target drove off): after 8 scans the echo no longer blanks.
    expect(map.match(meas(19, 2, 2))).toBe(Infinity);
    map.expire(80, 60);
    expect(map.size).toBe(0);
  });

  it('defaults', () => {
    expect(resolveFixedEchoOptions()).toEqual({ enabled: true, afterS: 0, moveThresholdM: 0.15, forgetS: 60 });
    expect(() => resolveFixedEchoOptions({ moveThresholdM: 0 })).toThrow(/positive/);
  });
});
