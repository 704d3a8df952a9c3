/**
 * Process-noise covariance matrices for the kinematic models, per axis (Bar-Shalom, Li &
 * Kirubarajan 2001, §6.2–6.3). Returned row-major as plain arrays so tests can compare them
 * entry by entry; the Kalman filter copies them into its own buffers.
 */

export type ProcessNoiseModel = 'dwna' | 'cwna';

/** Discrete white-noise acceleration, constant-velocity model: σ²·[[T⁴/4, T³/2], [T³/2, T²]]. */
export function dwnaCv(T: number, sigma2: number): [number, number, number, number] {
  const T2 = T * T;
  return [(sigma2 * T2 * T2) / 4, (sigma2 * T2 * T) / 2, (sigma2 * T2 * T) / 2, sigma2 * T2];
}

/** Continuous white-noise acceleration, constant-velocity model: q̃·[[T³/3, T²/2], [T²/2, T]]. */
export function cwnaCv(T: number, q: number): [number, number, number, number] {
  const T2 = T * T;
  return [(q * T2 * T) / 3, (q * T2) / 2, (q * T2) / 2, q * T];
}

/** Discrete Wiener process acceleration, constant-acceleration model (3×3, row-major). */
export function dwpaCa(T: number, sigma2: number): number[] {
  const T2 = T * T;
  const T3 = T2 * T;
  const T4 = T2 * T2;
  return [T4 / 4, T3 / 2, T2 / 2, T3 / 2, T2, T, T2 / 2, T, 1].map((v) => v * sigma2);
}

/** Continuous white-noise jerk, constant-acceleration model (3×3, row-major). */
export function cwnaCa(T: number, q: number): number[] {
  const T2 = T * T;
  const T3 = T2 * T;
  const T4 = T2 * T2;
  const T5 = T4 * T;
  return [T5 / 20, T4 / 8, T3 / 6, T4 / 8, T3 / 3, T2 / 2, T3 / 6, T2 / 2, T].map((v) => v * q);
}

/**
 * Per-axis CV process noise for the selected model. `level` is σ_a (m/s²) for DWNA, and for
 * CWNA the spectral density is taken as q̃ = σ_a²·T_ref with T_ref = 1 s, so that the same
 * number means roughly the same manoeuvre size in both models (common practice).
 */
export function cvProcessNoise(model: ProcessNoiseModel, T: number, sigmaA: number): [number, number, number, number] {
  return model === 'dwna' ? dwnaCv(T, sigmaA * sigmaA) : cwnaCv(T, sigmaA * sigmaA);
}

/** Position-variance entry q00 of cvProcessNoise without building the matrix (hot path). */
export function cvProcessNoise00(model: ProcessNoiseModel, T: number, sigmaA: number): number {
  const s2 = sigmaA * sigmaA;
  return model === 'dwna' ? (s2 * T * T * T * T) / 4 : (s2 * T * T * T) / 3;
}
