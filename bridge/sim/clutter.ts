/**
 * Amplitude of a false alarm. A square-law detector's noise power is exponential; a false alarm
 * is noise that crossed the threshold, and by the memoryless property its power above the threshold
 * is again exponential (common practice). With the threshold set for P_FA = 1e-6 on the noise
 * power, T = −ln(P_FA) ≈ 13.8 (Richards, *Fundamentals of Radar Signal Processing*, §6.2,
 * threshold for a known noise level).
 */
import type { Rng } from './prng.ts';
import type { ResolvedScenario } from './scenario.ts';

/** Threshold on noise power, in units of the mean noise power, for P_FA = 1e-6. */
export const FALSE_ALARM_THRESHOLD = -Math.log(1e-6);

export function falseAlarmAmplitude(sc: ResolvedScenario, rng: Rng): number {
  const excess = -Math.log(1 - rng.uniform()); // Exp(1)
  return Math.max(1e-6, sc.noiseAmplitude * Math.sqrt(FALSE_ALARM_THRESHOLD + excess));
}
