/**
 * From a reflector's true position to what the radar reports: polar conversion (azimuth clockwise
 * from +y), the radar's own errors (range scale and offset, azimuth offset), Gaussian noise, and
 * an echo amplitude.
 *
 * The amplitude model is deliberately simplified: the radar equation (Skolnik, *Introduction to
 * Radar Systems*, 3rd ed., eq. 1.3: received power ∝ σ/R⁴) makes the voltage amplitude
 * ∝ √σ / R²; optional Rayleigh fluctuation stands in for Swerling I; thermal noise adds a
 * complex Gaussian of power noiseAmplitude², so weak echoes are Rician. No antenna pattern,
 * no multipath, no near-field effects.
 */
import type { Point, KinematicState } from './trajectories.ts';
import type { ResolvedScenario } from './scenario.ts';
import type { Rng } from './prng.ts';

const TWO_PI = 2 * Math.PI;

/** Wraps an angle into [0, 2π), never returning 2π itself. */
export function wrapTwoPi(a: number): number {
  const w = a - TWO_PI * Math.floor(a / TWO_PI);
  return w >= TWO_PI ? 0 : w;
}

/** Wraps an angle into [-π, π). */
export function wrapPi(a: number): number {
  return wrapTwoPi(a + Math.PI) - Math.PI;
}

/** Range and azimuth (clockwise from +y) of a point seen from the radar at the origin. */
export function toPolar(x: number, y: number): { rangeM: number; azimuthRad: number } {
  return { rangeM: Math.hypot(x, y), azimuthRad: wrapTwoPi(Math.atan2(x, y)) };
}

/** Positioner frame → radar frame: p' = R·p + t, R counter-clockwise by `rotationRad`. */
export function positionerToRadar(s: KinematicState, rotationRad: number, t: Point): KinematicState {
  const c = Math.cos(rotationRad);
  const n = Math.sin(rotationRad);
  return { x: c * s.x - n * s.y + t.x, y: n * s.x + c * s.y + t.y, vx: c * s.vx - n * s.vy, vy: n * s.vx + c * s.vy };
}

/** Mean echo amplitude of a reflector of `rcsM2` at `rangeM` (see the module note). */
export function meanAmplitude(sc: ResolvedScenario, rcsM2: number, rangeM: number): number {
  const r = Math.max(rangeM, 0.05); // the R⁻² law means nothing inside a few wavelengths
  return (sc.referenceAmplitude * Math.sqrt(rcsM2)) / (r * r);
}

/** Detector amplitude: signal (optionally Rayleigh-fluctuating) plus complex Gaussian noise. */
export function sampleAmplitude(sc: ResolvedScenario, rng: Rng, signal: number): number {
  const s = sc.fluctuating ? signal * rng.rayleigh() : signal;
  const sn = sc.noiseAmplitude / Math.SQRT2;
  const re = s + rng.normal(0, sn);
  const im = rng.normal(0, sn);
  return Math.max(1e-6, Math.hypot(re, im));
}

/** Measured range and azimuth of a reflector at true radar-frame (x, y), with errors and noise. */
export function measurePolar(sc: ResolvedScenario, rng: Rng, p: Point): { rangeM: number; azimuthRad: number; trueRangeM: number } {
  const { rangeM, azimuthRad } = toPolar(p.x, p.y);
  const r = sc.rangeScale * rangeM + sc.rangeOffsetM + rng.normal(0, sc.sigmaRangeM);
  const az = azimuthRad + sc.azimuthOffsetRad + rng.normal(0, sc.sigmaAzimuthRad);
  // A negative range cannot come out of a delay measurement; fold it (only possible within σ of 0).
  return { rangeM: Math.abs(r), azimuthRad: wrapTwoPi(az), trueRangeM: rangeM };
}

/**
 * Pulse-to-pulse phase of an echo with radial velocity `radialMps` (positive receding):
 * Δφ = 4π·v_r·T/λ with T = 1/PRF, wrapped to [−π, π) as the hardware sees it (inverse of
 * v = λ·Δφ/(4π·T); common practice for pulse-pair phase), plus Gaussian phase noise.
 */
export function pulsePhase(sc: ResolvedScenario, rng: Rng, radialMps: number): number | undefined {
  if (!sc.phase) return undefined;
  const { prfHz, wavelengthM, sigmaRad } = sc.phase;
  return wrapPi((4 * Math.PI * radialMps) / (wavelengthM * prfHz) + rng.normal(0, sigmaRad));
}
