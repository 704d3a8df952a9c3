/**
 * Kalman filter, constant-velocity model in 2-D with variable time step.
 *
 * State [x, vx, y, vy]; covariance row-major in an array of 16. The products are written out
 * for this structure (F is the identity plus dt on two entries, H picks x and y) because the
 * tracker runs it hundreds of thousands of times a second and a generic matrix library would
 * allocate on every call.
 */
import type { Measurement } from '../types.ts';
import { discOf, mahalanobis2, type FilterEstimate, type GateDisc, type GateResult, type PositionPrediction, type TrackFilter } from './filter-types.ts';
import { cvProcessNoise, cvProcessNoise00, type ProcessNoiseModel } from './process-noise.ts';

export interface KalmanCvOptions {
  /** Process-noise model. */
  model: ProcessNoiseModel;
  /** Acceleration noise level σ_a, m/s² (DWNA), or √q̃ for CWNA. */
  sigmaAccel: number;
  /** Initial velocity standard deviation per axis, m/s (unknown velocity at track start). */
  sigmaVel0: number;
}

// Shared scratch for update(): single-threaded, never held across calls.
const SCRATCH_A = new Float64Array(8);
const SCRATCH_K = new Float64Array(8);
const PEEK: PositionPrediction = { x: 0, y: 0, pxx: 0, pxy: 0, pyy: 0 };

export class KalmanCv implements TrackFilter {
  timeS: number;
  // Plain arrays of doubles, not Float64Arrays: a 16-number typed array keeps its numbers in a
  // separate buffer outside the JS heap, while an array of doubles keeps them on the heap next to
  // the filter; gating reads a thousand tracks' covariances per batch, and with 800 targets this
  // was ×1.1–1.25 faster (no change at 100, where everything fits in cache). The 0.5 literal
  // makes each a double array from the start (overwritten by the constructor).
  /** State [x, vx, y, vy]. */
  readonly x: number[] = [0.5, 0, 0, 0];
  /** Covariance, row-major 4×4. */
  readonly P: number[] = [0.5, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0];
  /** Innovation and its covariance from the last update (IMM likelihoods use them). */
  lastNis = 0;
  lastDetS = 1;

  constructor(
    m: Measurement,
    private readonly o: KalmanCvOptions,
  ) {
    this.timeS = m.timeS;
    this.x[0] = m.x;
    this.x[2] = m.y;
    const v0 = o.sigmaVel0 * o.sigmaVel0;
    this.P[0] = m.rxx;
    this.P[2] = m.rxy;
    this.P[8] = m.rxy;
    this.P[10] = m.ryy;
    this.P[5] = v0;
    this.P[15] = v0;
  }

  /** Copies state and covariance from another CV filter (IMM mixing). */
  setFrom(x: ArrayLike<number>, P: ArrayLike<number>, timeS: number): void {
    for (let i = 0; i < 4; i++) this.x[i] = x[i];
    for (let i = 0; i < 16; i++) this.P[i] = P[i];
    this.timeS = timeS;
  }

  peek(t: number): PositionPrediction {
    return this.peekInto(t, { x: 0, y: 0, pxx: 0, pxy: 0, pyy: 0 });
  }

  /** peek() into a caller's object. */
  private peekInto(t: number, out: PositionPrediction): PositionPrediction {
    const dt = t - this.timeS;
    const P = this.P;
    const q00 = cvProcessNoise00(this.o.model, dt, this.o.sigmaAccel);
    // Position block of F P Fᵀ + Q.
    out.pxx = P[0] + 2 * dt * P[1] + dt * dt * P[5] + q00;
    out.pyy = P[10] + 2 * dt * P[11] + dt * dt * P[15] + q00;
    out.pxy = P[2] + dt * (P[3] + P[6]) + dt * dt * P[7];
    out.x = this.x[0] + dt * this.x[1];
    out.y = this.x[2] + dt * this.x[3];
    return out;
  }

  predict(t: number): void {
    const dt = t - this.timeS;
    if (dt === 0) return;
    const x = this.x;
    const P = this.P;
    x[0] += dt * x[1];
    x[2] += dt * x[3];
    // Rows: (F P) — row 0 += dt·row 1, row 2 += dt·row 3.
    for (let j = 0; j < 4; j++) {
      P[j] += dt * P[4 + j];
      P[8 + j] += dt * P[12 + j];
    }
    // Columns: (F P) Fᵀ — col 0 += dt·col 1, col 2 += dt·col 3.
    for (let i = 0; i < 4; i++) {
      P[i * 4] += dt * P[i * 4 + 1];
      P[i * 4 + 2] += dt * P[i * 4 + 3];
    }
    const q = cvProcessNoise(this.o.model, dt, this.o.sigmaAccel);
    const q00 = q[0];
    const q01 = q[1];
    const q10 = q[2];
    const q11 = q[3];
    P[0] += q00;
    P[1] += q01;
    P[4] += q10;
    P[5] += q11;
    P[10] += q00;
    P[11] += q01;
    P[14] += q10;
    P[15] += q11;
    this.timeS = t;
  }

  update(m: Measurement): number {
    const x = this.x;
    const P = this.P;
    const nx = m.x - x[0];
    const ny = m.y - x[2];
    const sxx = P[0] + m.rxx;
    const sxy = P[2] + m.rxy;
    const syy = P[10] + m.ryy;
    const det = sxx * syy - sxy * sxy;
    const nis = mahalanobis2(nx, ny, sxx, sxy, syy);
    const ixx = syy / det;
    const ixy = -sxy / det;
    const iyy = sxx / det;
    // PHᵀ = columns 0 and 2 of P; K = PHᵀ S⁻¹.
    const a = SCRATCH_A;
    const k = SCRATCH_K;
    for (let i = 0; i < 4; i++) {
      const c0 = P[i * 4];
      const c2 = P[i * 4 + 2];
      a[i * 2] = c0;
      a[i * 2 + 1] = c2;
      k[i * 2] = c0 * ixx + c2 * ixy;
      k[i * 2 + 1] = c0 * ixy + c2 * iyy;
    }
    for (let i = 0; i < 4; i++) x[i] += k[i * 2] * nx + k[i * 2 + 1] * ny;
    // P ← P − K (PHᵀ)ᵀ, then symmetrise against rounding.
    for (let i = 0; i < 4; i++) {
      for (let j = i; j < 4; j++) {
        const v = P[i * 4 + j] - (k[i * 2] * a[j * 2] + k[i * 2 + 1] * a[j * 2 + 1]);
        P[i * 4 + j] = v;
        P[j * 4 + i] = v;
      }
    }
    this.lastNis = nis;
    this.lastDetS = det;
    return nis;
  }

  gateDisc(t: number, gamma: number, rMax: number, out: GateDisc): GateDisc {
    return discOf(this.peekInto(t, PEEK), gamma, rMax, out);
  }

  gate(m: Measurement): GateResult {
    return this.gateInto(m, { d2: 0, logDetS: 0 });
  }

  /** gate() into a caller's object (the IMM calls it twice per candidate pair). */
  gateInto(m: Measurement, out: GateResult): GateResult {
    // Same as gateAgainst(this.peek(t), m) without the intermediate object.
    const dt = m.timeS - this.timeS;
    const P = this.P;
    const q00 = cvProcessNoise00(this.o.model, dt, this.o.sigmaAccel);
    const sxx = P[0] + 2 * dt * P[1] + dt * dt * P[5] + q00 + m.rxx;
    const syy = P[10] + 2 * dt * P[11] + dt * dt * P[15] + q00 + m.ryy;
    const sxy = P[2] + dt * (P[3] + P[6]) + dt * dt * P[7] + m.rxy;
    const nx = m.x - (this.x[0] + dt * this.x[1]);
    const ny = m.y - (this.x[2] + dt * this.x[3]);
    out.d2 = mahalanobis2(nx, ny, sxx, sxy, syy);
    out.logDetS = Math.log(sxx * syy - sxy * sxy);
    return out;
  }

  estimate(): FilterEstimate {
    const x = this.x;
    const P = this.P;
    return { x: x[0], y: x[2], vx: x[1], vy: x[3], pxx: P[0], pxy: P[2], pyy: P[10] };
  }
}
