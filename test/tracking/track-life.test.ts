import { describe, expect, it } from 'vitest';
import { resolveDeletionOptions, Track } from '../../bridge/tracking/track-life.ts';
import { lambdaMax } from '../../bridge/tracking/filter-types.ts';
import { KalmanCv } from '../../bridge/tracking/kalman-cv.ts';
import type { Detection, Measurement } from '../../bridge/types.ts';

const R = 0.0025;
const meas = (t: number, x: number, y = 3): Measurement => ({ timeS: t, x, y, rxx: R, rxy: 0, ryy: R });
const det = (t: number): Detection => ({ timeS: t, azimuthRad: 0, rangeM: 3, amplitude: 5 });

function newTrack(x0: number): Track {
  const f = new KalmanCv(meas(0, x0), { model: 'dwna', sigmaAccel: 0.3, sigmaVel0: 0.75 });
  return new Track(1, f, meas(0, x0), det(0), { m: 3, n: 4 });
}

function hit(t: Track, m: Measurement): void {
  t.filter.predict(m.timeS);
  t.onHit(m, t.filter.update(m), det(m.timeS), 0.15);
}

describe('track life', () => {
  it('confirms on M of N, coasts on misses and is deleted after maxMisses and minCoastS', () => {
    const t = newTrack(0);
    hit(t, meas(1, 0.2));
    expect(t.status).toBe('tentative');
    hit(t, meas(2, 0.4));
    expect(t.status).toBe('confirmed');
    const o = resolveDeletionOptions();
    t.onMiss();
    expect(t.status).toBe('coasting');
    t.onMiss();
    expect(t.deletionReason(5, o)).toBeNull();
    t.onMiss();
    expect(t.deletionReason(5, o)).toBe('misses');
    expect(t.quality).toBeLessThan(0.5);
  });

  it('reports its start (first detection) on every update, for the age shown by the dashboard', () => {
    const m0 = meas(3.25, 0.1);
    const t = new Track(4, new KalmanCv(m0, { model: 'dwna', sigmaAccel: 0.3, sigmaVel0: 0.75 }), m0, det(3.25), { m: 1, n: 1 });
    hit(t, meas(4.25, 0.2));
    t.onMiss();
    expect(t.update(true).startS).toBe(3.25);
    expect(t.update(false).startS).toBe(3.25);
  });

  it('fails a tentative track that cannot reach M of N', () => {
    const t = newTrack(0);
    t.onMiss();
    expect(t.failedInitiation()).toBe(false);
    t.onMiss();
    expect(t.failedInitiation()).toBe(true);
  });

  it('counts as moving only after leaving its start for three hits in a row, and stays so when it stops', () => {
    const t = newTrack(0);
    for (let k = 1; k <= 5; k++) hit(t, meas(k, 0.01 * (k % 2)));
    expect(t.moved).toBe(false);
    for (let k = 6; k <= 14; k++) hit(t, meas(k, 0.25 * (k - 5)));
    expect(t.moved).toBe(true);
    for (let k = 15; k <= 60; k++) hit(t, meas(k, 2.25));
    expect(t.moved).toBe(true); // a pause keeps the track a target
    expect(t.update(true).speed).toBeLessThan(0.05);
  });

  it('deletes on covariance growth', () => {
    const t = newTrack(0);
    hit(t, meas(1, 0));
    hit(t, meas(2, 0));
    t.filter.predict(30);
    expect(t.deletionReason(30, resolveDeletionOptions())).toBe('covariance');
    // λmax of [[2, 1], [1, 2]] is 3 (common practice: (a+c)/2 + √(((a−c)/2)² + b²)).
    expect(lambdaMax(2, 1, 2)).toBeCloseTo(3, 12);
  });
});
