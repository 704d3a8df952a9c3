/**
 * When the antenna looks at a reflector.
 *
 * Rotating: the beam points at startAz + 2π·t/T (clockwise) and a reflector gives one detection
 * per sweep, at the instant the beam centre crosses it (the plot extractor's centroid). Because
 * the reflector may move during the sweep, the crossing is found numerically: the angle of the
 * reflector ahead of the beam, wrap(θ(t) − beam(t)), falls steadily as the beam advances and jumps
 * from ~0 to ~2π at the crossing; the jump is bracketed on a coarse grid and bisected.
 * Staring: every reflector inside the sector is looked at `rateHz` times a second.
 */
import type { ResolvedAntenna } from './scenario.ts';
import { wrapPi, wrapTwoPi } from './measure.ts';

/** Coarse samples per revolution; the beam moves 22.5° between samples, far faster than a bench target. */
const GRID = 16;
/** Bisection steps: T/16 / 2³⁰ is below a nanosecond for any plausible period. */
const BISECT = 30;

/** Beam azimuth of a rotating antenna at time t. */
export function beamAzimuth(periodS: number, startAzimuthRad: number, tS: number): number {
  return wrapTwoPi(startAzimuthRad + (2 * Math.PI * tS) / periodS);
}

/**
 * Times in (t0, t1] at which the rotating beam crosses a reflector whose azimuth is `azimuthAt(t)`.
 * Windows that share an end never report the same crossing twice: a crossing is attributed to the
 * grid interval whose right end lies past it.
 */
export function beamCrossings(periodS: number, startAzimuthRad: number, t0: number, t1: number, azimuthAt: (tS: number) => number): number[] {
  const ahead = (t: number) => wrapTwoPi(azimuthAt(t) - beamAzimuth(periodS, startAzimuthRad, t));
  const out: number[] = [];
  const steps = Math.max(1, Math.ceil((GRID * (t1 - t0)) / periodS));
  const dt = (t1 - t0) / steps;
  let ta = t0;
  let fa = ahead(ta);
  for (let i = 1; i <= steps; i++) {
    const tb = i === steps ? t1 : t0 + i * dt;
    const fb = ahead(tb);
    if (fb - fa > Math.PI) {
      // The jump lies in (ta, tb]: keep lo on the "just before" side (small angle ahead).
      let lo = ta;
      let hi = tb;
      for (let k = 0; k < BISECT; k++) {
        const mid = 0.5 * (lo + hi);
        if (ahead(mid) < Math.PI) lo = mid;
        else hi = mid;
      }
      out.push(hi);
    }
    ta = tb;
    fa = fb;
  }
  return out;
}

/** Whether a staring antenna covers the azimuth. A rotating antenna covers all of them. */
export function inSector(antenna: ResolvedAntenna, azimuthRad: number): boolean {
  if (antenna.mode === 'rotating') return true;
  return Math.abs(wrapPi(azimuthRad - antenna.centerAzimuthRad)) <= antenna.sectorRad / 2;
}

/** Look times of a staring antenna in (t0, t1]: multiples of 1/rate. */
export function staringLooks(rateHz: number, t0: number, t1: number): number[] {
  const out: number[] = [];
  for (let n = Math.floor(t0 * rateHz) + 1; n / rateHz <= t1; n++) out.push(n / rateHz);
  return out;
}
