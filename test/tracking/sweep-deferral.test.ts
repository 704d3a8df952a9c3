import { describe, expect, it } from 'vitest';
import { heldBack, REHOLD_LIMIT } from '../../bridge/tracking/sweep-deferral.ts';
import { Track } from '../../bridge/tracking/track-life.ts';
import { createFilter, resolveFilterOptions } from '../../bridge/tracking/filter.ts';
import type { Detection, Measurement } from '../../bridge/types.ts';

const meas = (timeS: number, x: number, y: number): Measurement => ({ timeS, x, y, rxx: 0.0025, rxy: 0, ryy: 0.0025 });
const det = (timeS: number): Detection => ({ timeS, azimuthRad: 0, rangeM: 3, amplitude: 1 });

/** A confirmed track parked at (x, y), last hit at t = 0. */
function track(id: number, x: number, y: number): Track {
  const m = meas(0, x, y);
  const t = new Track(id, createFilter(m, resolveFilterOptions({ kind: 'kalman' }), 0.1, 1), m, det(0), { m: 1, n: 1 });
  return t;
}

describe('sweep deferral', () => {
  // 1 s revolution; the beam at azimuth 0 (straight ahead, +y) at t = 1.
  const gamma = 9.2103; // 99 % χ², 2 dof (NIST/SEMATECH e-Handbook of Statistical Methods, χ² table)
  it('holds a detection two tracks compete for while their gates lie ahead of the beam, until the beam has passed them', () => {
    // Two tracks 10 cm apart at 3 m, 10° clockwise of the beam: both gates are ahead of it.
    const az = (10 * Math.PI) / 180;
    const a = track(1, 3 * Math.sin(az), 3 * Math.cos(az));
    const b = track(2, 3 * Math.sin(az) + 0.1, 3 * Math.cos(az));
    const live = new Map([[1, a], [2, b]]);
    const pairs = [{ track: 1, det: 0, cost: 1 }, { track: 2, det: 0, cost: 2 }];
    const r = heldBack(pairs, [1], live, new Map(), 1, 0, gamma, 1, 0.5);
    // Released once the beam has turned past the farther gate: beyond the tracks' own 10°, by the
    // gate's half-width at 3 m (a few tenths of a metre after a one-second prediction: < 20°).
    expect(r[0]).toBeGreaterThan(1 + 10 / 360);
    expect(r[0]).toBeLessThan(1 + 30 / 360);
    // The same pair with the beam already past both gates: decided at once.
    expect(Number.isNaN(heldBack(pairs, [1], live, new Map(), 1, (40 * Math.PI) / 180, gamma, 1, 0.5)[0])).toBe(true);
  });

  it('does not hold a lone track with a detection its likely model expects', () => {
    const az = (10 * Math.PI) / 180;
    const a = track(1, 3 * Math.sin(az), 3 * Math.cos(az));
    const r = heldBack([{ track: 1, det: 0, cost: 1 }], [1], new Map([[1, a]]), new Map(), 1, 0, gamma, 1, 0.5);
    expect(Number.isNaN(r[0])).toBe(true);
    // ...but does when that detection is admitted only by a manoeuvre model, and never past the wait cap.
    const u = heldBack([{ track: 1, det: 0, cost: 1, unlikely: true }], [1], new Map([[1, a]]), new Map(), 1, 0, gamma, 1, 0.01);
    expect(u[0]).toBeCloseTo(1.01, 9);
  });

  it('holds a cluster whose detection has already been held REHOLD_LIMIT times until its longest wait, in one go', () => {
    // Two detections (t = 0.9 and t = 1) that two tracks ahead of the beam compete for.
    const az = (10 * Math.PI) / 180;
    const a = track(1, 3 * Math.sin(az), 3 * Math.cos(az));
    const b = track(2, 3 * Math.sin(az) + 0.1, 3 * Math.cos(az));
    const live = new Map([[1, a], [2, b]]);
    const pairs = [{ track: 1, det: 0, cost: 1 }, { track: 2, det: 0, cost: 2 }, { track: 2, det: 1, cost: 1 }];
    const fresh = heldBack(pairs, [0.9, 1], live, new Map(), 1, 0, gamma, 1, 0.5, [0, 0]);
    // Fresh: released when the beam has passed the gates, well before the cap (0.9 + 0.5).
    expect(fresh[0]).toBeLessThan(1 + 30 / 360);
    expect(fresh[1]).toBe(fresh[0]);
    const under = heldBack(pairs, [0.9, 1], live, new Map(), 1, 0, gamma, 1, 0.5, [REHOLD_LIMIT - 1, 0]);
    expect(under[0]).toBe(fresh[0]);
    // The older detection has been held REHOLD_LIMIT times: the whole cluster waits to the cap.
    const capped = heldBack(pairs, [0.9, 1], live, new Map(), 1, 0, gamma, 1, 0.5, [REHOLD_LIMIT, 0]);
    expect(capped[0]).toBeCloseTo(1.4, 12);
    expect(capped[1]).toBeCloseTo(1.4, 12);
  });
});
