/**
 * Infers the antenna kind and timing from the detections themselves, so `track` needs no bench
 * description: a rotating antenna reports azimuths that creep forward and wrap from 2π to 0 once
 * per revolution; a staring antenna reports azimuths that jitter back and forth around its beam.
 */
import type { Detection } from '../types.ts';

export type AntennaKind = 'rotating' | 'staring';

export interface AntennaInference {
  kind: AntennaKind;
  /** Revolution period for a rotating antenna, s; NaN for a staring one. */
  periodS: number;
  /** Typical time between two detections of the same target, s; NaN when nothing repeats. */
  intervalS: number;
  /** Wrap-arounds (2π → 0) seen. */
  wraps: number;
  /** Share of consecutive detection pairs whose azimuth stepped forward (or wrapped). */
  forwardFraction: number;
  /** Detections the inference looked at. */
  detections: number;
}

const TWO_PI = 2 * Math.PI;
/**
 * Azimuth noise makes neighbouring detections of a crowded scan step back a little; steps back by
 * less than this (about 3σ of a typical encoder-plus-beam error, 1.5°: common practice) still
 * count as forward.
 */
const JITTER_RAD = (5 * Math.PI) / 180;
/** Wraps closer than this are one crossing of the zero reference, s (far below any bench's period). */
const WRAP_MERGE_S = 0.05;
/** Shortest revolution period taken for a rotating antenna, s (benches turn at 0.5–2 s: common practice). */
const MIN_PERIOD_S = 0.1;

function median(v: number[]): number {
  if (v.length === 0) return NaN;
  const s = [...v].sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

export function inferAntenna(dets: readonly Detection[]): AntennaInference {
  let forward = 0;
  let pairs = 0;
  const wrapTimes: number[] = [];
  let lastWrapS = -Infinity;
  for (let i = 1; i < dets.length; i++) {
    const d = dets[i].azimuthRad - dets[i - 1].azimuthRad;
    pairs++;
    if (d < -Math.PI) {
      forward++;
      const t = 0.5 * (dets[i].timeS + dets[i - 1].timeS);
      // Azimuth noise around 0° wraps a dense scan back and forth within a few detections: one
      // crossing of the zero reference, not several revolutions (a run of 800 targets had twice
      // as many "wraps" as revolutions, and a period 3 % short). Wraps in a chain, each close to
      // the one before, are one crossing; a staring beam astride 0° is then one endless chain.
      if (!(t - lastWrapS < WRAP_MERGE_S)) wrapTimes.push(t);
      lastWrapS = t;
    } else if (d >= -JITTER_RAD) forward++;
  }
  const forwardFraction = pairs ? forward / pairs : 0;
  const base = { wraps: wrapTimes.length, forwardFraction, detections: dets.length };
  if (forwardFraction >= 0.9 && wrapTimes.length >= 2) {
    const periodS = refinePeriod(dets, median(wrapTimes.slice(1).map((t, i) => t - wrapTimes[i])));
    // A staring beam centred on 0° with reflectors either side also "wraps" at every detection;
    // no positioner bench spins its antenna ten times a second, so such a period means staring.
    if (periodS >= MIN_PERIOD_S) return { kind: 'rotating', periodS, intervalS: periodS, ...base };
  }
  // One reflector in view shows no wrap-around pattern; a detection per reflector every few
  // tenths of a second or slower is still a scanning antenna for all the tracker cares.
  const intervalS = stareInterval(dets);
  if (intervalS >= 0.2) return { kind: 'rotating', periodS: intervalS, intervalS, ...base };
  return { kind: 'staring', periodS: NaN, intervalS, ...base };
}

/**
 * Least-squares slope of the unwrapped azimuth against time. Revolutions without any detection
 * are bridged by rounding the expected advance to whole turns.
 */
function refinePeriod(dets: readonly Detection[], rough: number): number {
  if (!(rough > 0)) return rough;
  let turns = 0;
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  const t0 = dets[0].timeS;
  for (let i = 0; i < dets.length; i++) {
    if (i > 0) {
      const dt = dets[i].timeS - dets[i - 1].timeS;
      let step = dets[i].azimuthRad - dets[i - 1].azimuthRad;
      if (step < 0) step += TWO_PI;
      const expected = (TWO_PI * dt) / rough;
      turns += step + TWO_PI * Math.round((expected - step) / TWO_PI);
    }
    const t = dets[i].timeS - t0;
    const a = dets[0].azimuthRad + turns;
    sx += t;
    sy += a;
    sxx += t * t;
    sxy += t * a;
  }
  const n = dets.length;
  const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
  return slope > 0 ? TWO_PI / slope : rough;
}

/**
 * Staring antenna: the median time from a detection back to the previous detection within 0.3 m
 * of it (the same reflector, most of the time), over a 0.3 m grid.
 */
function stareInterval(dets: readonly Detection[]): number {
  const cell = 0.3;
  const last = new Map<number, number>();
  const gaps: number[] = [];
  for (const d of dets) {
    const x = d.rangeM * Math.sin(d.azimuthRad);
    const y = d.rangeM * Math.cos(d.azimuthRad);
    const ix = Math.floor(x / cell);
    const iy = Math.floor(y / cell);
    let best = -Infinity;
    for (let a = -1; a <= 1; a++) {
      for (let b = -1; b <= 1; b++) {
        const t = last.get((ix + a) * 100003 + (iy + b));
        if (t !== undefined && t > best && t < d.timeS) best = t;
      }
    }
    if (best > -Infinity) gaps.push(d.timeS - best);
    last.set(ix * 100003 + iy, d.timeS);
  }
  const m = median(gaps);
  return m > 0 ? m : NaN;
}
