import { describe, expect, it } from 'vitest';
import { GateIndex, type IndexedTrack } from '../../bridge/tracking/gate-index.ts';
import { enclosingDisc, lambdaMax } from '../../bridge/tracking/filter-types.ts';
import { ImmCv2 } from '../../bridge/tracking/imm.ts';
import { KalmanCv } from '../../bridge/tracking/kalman-cv.ts';
import { convertUnbiased, noiseAtRange } from '../../bridge/tracking/measurement.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Measurement } from '../../bridge/types.ts';

const GAMMA = 9.2103; // χ² 2 dof, 99 % (NIST/SEMATECH e-Handbook, table of χ² critical values)
const MAX_SPEED = 1.5;
const imm = { model: 'dwna' as const, sigmaLow: 0.05, sigmaHigh: 1, sojournLowS: 10, sojournHighS: 2, sigmaVel0: 0.75 };

/** A detection at polar (r, θ) with 5 cm / 1.5° noise, as the tracker converts it (Mo et al. 1998). */
const SIGMAS = { conversion: 'unbiased' as const, sigmaRangeM: 0.05, sigmaAzimuthRad: (1.5 * Math.PI) / 180, rangeOffsetM: 0, azimuthOffsetRad: 0 };
const meas = (t: number, r: number, theta: number): Measurement => convertUnbiased(r, theta, SIGMAS.sigmaRangeM, SIGMAS.sigmaAzimuthRad, t);
const noise = (r: number) => noiseAtRange(r, SIGMAS);

function track(id: number, m: Measurement, filter: IndexedTrack['filter']): IndexedTrack {
  return { id, filter, lastRMax: lambdaMax(m.rxx, m.rxy, m.ryy), recent: [m], reachUntilS: -Infinity };
}

/** What gating.ts admits: the speed bound from the last hit and the χ² gate. */
function admits(t: IndexedTrack, m: Measurement): boolean {
  const h = t.recent[t.recent.length - 1];
  const sig = Math.sqrt(Math.max(h.rxx + m.rxx, h.ryy + m.ryy));
  const reach = MAX_SPEED * Math.max(0, m.timeS - h.timeS) + 3 * sig;
  if (Math.hypot(m.x - h.x, m.y - h.y) > reach) return false;
  return t.filter.gate(m).d2 < GAMMA;
}

describe('GateIndex', () => {
  it('returns every track whose gate admits a detection, however long the track has coasted (against brute force)', () => {
    const rng = createRng(11);
    const index = new GateIndex(2, GAMMA, 1, MAX_SPEED, noise);
    const live = new Map<number, IndexedTrack>();
    // Tracks over a 7 m bench, each updated once a second for a while, some then left to coast.
    for (let id = 1; id <= 60; id++) {
      const r = rng.between(0.5, 7);
      const th = rng.between(0, 2 * Math.PI);
      const vx = rng.between(-0.8, 0.8);
      const vy = rng.between(-0.8, 0.8);
      const m0 = meas(0, r, th);
      const f = id % 3 === 0 ? new KalmanCv(m0, { model: 'dwna', sigmaAccel: 0.3, sigmaVel0: 0.75 }) : new ImmCv2(m0, imm);
      const t = track(id, m0, f);
      const hits = Math.floor(rng.between(1, 6));
      for (let k = 1; k <= hits; k++) {
        const x = m0.x + vx * k;
        const y = m0.y + vy * k;
        const m = meas(k, Math.hypot(x, y), Math.atan2(y, x));
        f.predict(k);
        f.update(m);
        (t.recent as Measurement[]).push(m);
      }
      live.set(id, t);
      index.place(t);
    }
    let admitted = 0;
    const missed: string[] = [];
    for (const now of [6, 7.5, 9, 12]) {
      index.refresh(now, live);
      for (let q = 0; q < 1500; q++) {
        const m = meas(now, rng.between(0.3, 9), rng.between(0, 2 * Math.PI));
        const found = new Set(index.query(m.x, m.y));
        for (const t of live.values()) {
          if (!admits(t, m)) continue;
          admitted++;
          const d = index.discOf(t)!;
          const inDisc = Math.hypot(m.x - d.x, m.y - d.y) <= d.r;
          if (!found.has(t) || !inDisc) missed.push(`track ${t.id} at ${now} s: (${m.x.toFixed(2)}, ${m.y.toFixed(2)})`);
        }
      }
    }
    expect(missed).toEqual([]);
    // The check is not vacuous: many pairs were admitted, including by tracks coasting for seconds.
    expect(admitted).toBeGreaterThan(200);
  });

  it('draws a disc no wider than the speed bound for a track that coasts long', () => {
    const m0 = meas(0, 3, 0.3);
    const t = track(1, m0, new ImmCv2(m0, imm));
    const index = new GateIndex(2, GAMMA, 1, MAX_SPEED, noise);
    index.place(t, 10);
    // 1.5 m/s for 10 s plus 3σ of two detections' noise: the last hit's and that of a detection
    // at the disc's far edge (the disc is centred on the last hit), which it must cover.
    const bound = (far: number) => MAX_SPEED * 10 + 3 * Math.sqrt(Math.max(m0.rxx, m0.ryy) + noise(far));
    const d = index.discOf(t)!;
    const edge = Math.hypot(m0.x, m0.y) + d.r;
    expect(d.r).toBeGreaterThanOrEqual(bound(edge));
    expect(d.r).toBeLessThanOrEqual(bound(2 * edge));
    expect(d.x).toBe(m0.x);
    expect(t.reachUntilS).toBe(10);
  });

  it('forgets a removed track and skips it when refreshing', () => {
    const m0 = meas(0, 3, 0.3);
    const t = track(1, m0, new KalmanCv(m0, { model: 'dwna', sigmaAccel: 0.3, sigmaVel0: 0.75 }));
    const index = new GateIndex(2, GAMMA, 1, MAX_SPEED, noise);
    const live = new Map([[1, t]]);
    index.place(t);
    expect(index.query(m0.x, m0.y)).toContain(t);
    live.delete(1);
    index.remove(t);
    index.refresh(5, live);
    expect(index.size).toBe(0);
    expect(index.query(m0.x, m0.y)).not.toContain(t);
  });
});

describe('enclosingDisc', () => {
  it('holds both discs and touches each (plane geometry)', () => {
    const rng = createRng(3);
    for (let i = 0; i < 200; i++) {
      const a = { x: rng.between(-5, 5), y: rng.between(-5, 5), r: rng.between(0, 3) };
      const b = { x: rng.between(-5, 5), y: rng.between(-5, 5), r: rng.between(0, 3) };
      const e = enclosingDisc(a, b);
      expect(Math.hypot(a.x - e.x, a.y - e.y) + a.r).toBeLessThanOrEqual(e.r + 1e-9);
      expect(Math.hypot(b.x - e.x, b.y - e.y) + b.r).toBeLessThanOrEqual(e.r + 1e-9);
      // Smallest: its diameter is the span of the two discs along the line of centres (or the larger disc).
      const d = Math.hypot(a.x - b.x, a.y - b.y);
      expect(e.r).toBeCloseTo(Math.max(a.r, b.r, 0.5 * (d + a.r + b.r)), 9);
    }
  });
});
