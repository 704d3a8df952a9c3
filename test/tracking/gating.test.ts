import { describe, expect, it } from 'vitest';
import { gateBatch, MANOEUVRE_AMPLITUDE_FLOOR } from '../../bridge/tracking/gating.ts';
import { createFilter } from '../../bridge/tracking/filter.ts';
import { gateThreshold } from '../../bridge/tracking/gate.ts';
import { resolveTrackerOptions } from '../../bridge/tracking/tracker-options.ts';
import { Track } from '../../bridge/tracking/track-life.ts';
import type { Detection, Measurement } from '../../bridge/types.ts';

const R = 0.0025; // (5 cm)²
const GAMMA = gateThreshold(0.99, 2);
const meas = (t: number, x: number, y: number): Measurement => ({ timeS: t, x, y, rxx: R, rxy: 0, ryy: R });
const det = (t: number, amplitude: number): Detection => ({ timeS: t, azimuthRad: 0, rangeM: 3, amplitude });

/** A confirmed track on the default filter (the IMM), driven along +x at 0.3 m/s, one hit per 0.5 s. */
function steadyTrack(amplitudes: (k: number) => number): Track {
  const o = resolveTrackerOptions({});
  const m0 = meas(0, 0, 3);
  const t = new Track(1, createFilter(m0, o.filter, 0.75, 0.5), m0, det(0, amplitudes(0)), o.initiation);
  for (let k = 1; k <= 12; k++) {
    const m = meas(0.5 * k, 0.15 * k, 3);
    t.filter.predict(m.timeS);
    t.onHit(m, t.filter.update(m), det(m.timeS, amplitudes(k)), 0.15);
  }
  expect(t.status).toBe('confirmed');
  return t;
}

/** The pairs one detection at (x, y) with `amplitude` makes with the track. */
function pairsFor(t: Track, x: number, y: number, amplitude: number) {
  const m = meas(6.5, x, y);
  return gateBatch([m], { query: () => [t] }, null, GAMMA, 0, Infinity, [{ amplitude }]).established;
}

/** The first offset across the track at which only the manoeuvre model still gates a detection. */
function manoeuvreOnlyOffset(t: Track): number {
  for (let dy = 0; dy < 3; dy += 0.01) {
    const g = t.filter.gate(meas(6.5, 1.95, 3 + dy));
    if (g.d2 < GAMMA && !((g.d2Likely ?? g.d2) < GAMMA)) return dy;
  }
  return NaN;
}

describe('gating one batch', () => {
  it('pairs a detection the likely model expects whatever its amplitude', () => {
    const t = steadyTrack(() => 60);
    const pairs = pairsFor(t, 1.95, 3, 3);
    expect(pairs).toHaveLength(1);
    expect(pairs[0].unlikely).toBe(false);
  });

  it('keeps a faint false alarm out of the manoeuvre gate but not a strong echo', () => {
    const t = steadyTrack(() => 60);
    const dy = manoeuvreOnlyOffset(t);
    expect(dy).toBeGreaterThan(0.1); // the CV model's gate is the narrower one
    // Strong: a manoeuvre of the same reflector, taken (as an unlikely pair).
    const strong = pairsFor(t, 1.95, 3 + dy, 50);
    expect(strong).toHaveLength(1);
    expect(strong[0].unlikely).toBe(true);
    // Faint: below a fifth of the track's amplitude, refused.
    expect(pairsFor(t, 1.95, 3 + dy, MANOEUVRE_AMPLITUDE_FLOOR * 60 * 0.9)).toHaveLength(0);
    expect(pairsFor(t, 1.95, 3 + dy, MANOEUVRE_AMPLITUDE_FLOOR * 60 * 1.1)).toHaveLength(1);
  });

  it('judges faintness against the latest hits, so an echo that faded with range is still taken', () => {
    // Amplitude down by 7× over the run (1/R² from 1.5 m to 4 m): the run's mean stays far above
    // the latest echoes, the recent level follows them.
    const t = steadyTrack((k) => 70 / (1 + 0.5 * k));
    const last = 70 / (1 + 0.5 * 12);
    expect(t.amplitude * MANOEUVRE_AMPLITUDE_FLOOR).toBeGreaterThan(0.4 * last);
    expect(t.recentAmplitude).toBeLessThan(1.5 * last);
    const dy = manoeuvreOnlyOffset(t);
    expect(pairsFor(t, 1.95, 3 + dy, 0.4 * last)).toHaveLength(1);
  });

  it('applies no floor to a tentative track (it has no amplitude history to speak of)', () => {
    const o = resolveTrackerOptions({});
    const m0 = meas(0, 0, 3);
    const t = new Track(2, createFilter(m0, o.filter, 0.75, 0.5), m0, det(0, 60), o.initiation);
    const g = gateBatch([meas(0.5, 0.3, 3.1)], { query: () => [t] }, null, GAMMA, 0, Infinity, [{ amplitude: 1 }]);
    expect(g.tentative).toHaveLength(1);
  });
});
