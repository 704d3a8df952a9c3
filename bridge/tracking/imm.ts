/**
 * Interacting multiple model filter of two constant-velocity models at two process-noise levels
 * (Blom & Bar-Shalom 1988; Bar-Shalom, Li & Kirubarajan 2001, §11.6).
 *
 * Why CV at two levels rather than CV + CA: the positioner either glides at a steady speed or
 * changes speed abruptly (start, stop, reverse, the ends of a figure-eight lobe). A quiet CV
 * model smooths the glides; a loud CV model absorbs the jumps within one or two scans. A CA model
 * would need several scans to learn an acceleration that is gone again by then, and its extra
 * states add lag noise at one detection per revolution. Both models share the state layout, so
 * mixing needs no state augmentation.
 *
 * Mode switching is a continuous-time Markov chain: the probability of leaving mode i during dt
 * is 1 − exp(−dt/τ_i), so the filter behaves the same at 2 s revolutions and at 200 Hz staring.
 */
import type { Measurement } from '../types.ts';
import { enclosingDisc, type FilterEstimate, type GateDisc, type GateResult, type PositionPrediction, type TrackFilter } from './filter-types.ts';
import { KalmanCv } from './kalman-cv.ts';
import type { ProcessNoiseModel } from './process-noise.ts';

export interface ImmOptions {
  /** Process-noise model of both CV models. */
  model: ProcessNoiseModel;
  /** σ_a of the quiet model, m/s². */
  sigmaLow: number;
  /** σ_a of the manoeuvre model, m/s². */
  sigmaHigh: number;
  /** Mean sojourn time in the quiet model, s. */
  sojournLowS: number;
  /** Mean sojourn time in the manoeuvre model, s. */
  sojournHighS: number;
  /** Initial velocity standard deviation per axis, m/s. */
  sigmaVel0: number;
}

// Gate scratch: filled and consumed within one gate() call.
const GATE_A: GateResult = { d2: 0, logDetS: 0 };
const GATE_B: GateResult = { d2: 0, logDetS: 0 };
// gate()'s answer: read it before the next gate() call (the tracker gates hundreds of thousands of
// pairs a second; a fresh object each time was a good part of its garbage).
const GATE_OUT: GateResult = { d2: 0, logDetS: 0, d2Likely: 0 };
// Mixing scratch: filled and consumed within one predict() call.
const MIX_X = [new Float64Array(4), new Float64Array(4)];
const MIX_P = [new Float64Array(16), new Float64Array(16)];
const MIX_W = new Float64Array(4);
// gateDisc scratch: one disc per model.
const DISC_A: GateDisc = { x: 0, y: 0, r: 0 };
const DISC_B: GateDisc = { x: 0, y: 0, r: 0 };

export class ImmCv2 implements TrackFilter {
  readonly models: [KalmanCv, KalmanCv];
  /** Mode probabilities [quiet, manoeuvre]. */
  readonly mu = [0.8, 0.2];

  constructor(m: Measurement, private readonly o: ImmOptions) {
    this.models = [
      new KalmanCv(m, { model: o.model, sigmaAccel: o.sigmaLow, sigmaVel0: o.sigmaVel0 }),
      new KalmanCv(m, { model: o.model, sigmaAccel: o.sigmaHigh, sigmaVel0: o.sigmaVel0 }),
    ];
  }

  get timeS(): number {
    return this.models[0].timeS;
  }

  /** Transition matrix entries for a step dt: [p00, p01, p10, p11]. */
  private transition(dt: number): [number, number, number, number] {
    const p01 = 1 - Math.exp(-dt / this.o.sojournLowS);
    const p10 = 1 - Math.exp(-dt / this.o.sojournHighS);
    return [1 - p01, p01, p10, 1 - p10];
  }

  /** Predicted mode probabilities c_j = Σ_i π_ij μ_i. */
  private predictedMu(dt: number): [number, number] {
    const t = this.transition(dt);
    const p00 = t[0];
    const p01 = t[1];
    const p10 = t[2];
    const p11 = t[3];
    return [p00 * this.mu[0] + p10 * this.mu[1], p01 * this.mu[0] + p11 * this.mu[1]];
  }

  peek(t: number): PositionPrediction {
    const c = this.predictedMu(t - this.timeS);
    const a = this.models[0].peek(t);
    const b = this.models[1].peek(t);
    return combine(a, b, c[0], c[1]);
  }

  /** Both models' gate discs: the gate is their union (see gate()). */
  gateDisc(t: number, gamma: number, rMax: number, out: GateDisc): GateDisc {
    return enclosingDisc(this.models[0].gateDisc(t, gamma, rMax, DISC_A), this.models[1].gateDisc(t, gamma, rMax, DISC_B), out);
  }

  /**
   * Union of the two models' gates: a detection the manoeuvre model expects is in the gate even
   * while the quiet model dominates, which is exactly the moment a stop or a reversal begins.
   * `d2 + logDetS` is the better model's assignment cost.
   */
  gate(m: Measurement): GateResult {
    const a = this.models[0].gateInto(m, GATE_A);
    const b = this.models[1].gateInto(m, GATE_B);
    // In the gate if either model expects it; but priced by the model that explains it best
    // (smallest d² + ln|S|), so the manoeuvre model's wide gate does not make a neighbour's
    // detection look as cheap as the track's own when two targets cross.
    const ca = a.d2 + a.logDetS;
    const cb = b.d2 + b.logDetS;
    const d2 = Math.min(a.d2, b.d2);
    GATE_OUT.d2 = d2;
    GATE_OUT.logDetS = Math.min(ca, cb) - d2;
    GATE_OUT.d2Likely = this.mu[0] >= this.mu[1] ? a.d2 : b.d2;
    return GATE_OUT;
  }

  predict(t: number): void {
    const dt = t - this.timeS;
    if (dt <= 0) return;
    const p01 = 1 - Math.exp(-dt / this.o.sojournLowS);
    const p10 = 1 - Math.exp(-dt / this.o.sojournHighS);
    const p00 = 1 - p01;
    const p11 = 1 - p10;
    const c0 = p00 * this.mu[0] + p10 * this.mu[1];
    const c1 = p01 * this.mu[0] + p11 * this.mu[1];
    // Mixing weights μ_{i|j} = π_ij μ_i / c_j, row j = [from quiet, from manoeuvre].
    const w = MIX_W;
    w[0] = (p00 * this.mu[0]) / c0;
    w[1] = (p10 * this.mu[1]) / c0;
    w[2] = (p01 * this.mu[0]) / c1;
    w[3] = (p11 * this.mu[1]) / c1;
    const m0 = this.models[0];
    const m1 = this.models[1];
    for (let j = 0; j < 2; j++) {
      const x = MIX_X[j];
      const P = MIX_P[j];
      const wa = w[2 * j];
      const wb = w[2 * j + 1];
      for (let i = 0; i < 4; i++) x[i] = wa * m0.x[i] + wb * m1.x[i];
      for (let r = 0; r < 4; r++) {
        const da = m0.x[r] - x[r];
        const db = m1.x[r] - x[r];
        for (let s = 0; s < 4; s++) {
          P[r * 4 + s] =
            wa * (m0.P[r * 4 + s] + da * (m0.x[s] - x[s])) + wb * (m1.P[r * 4 + s] + db * (m1.x[s] - x[s]));
        }
      }
    }
    const t0 = this.timeS;
    m0.setFrom(MIX_X[0], MIX_P[0], t0);
    m1.setFrom(MIX_X[1], MIX_P[1], t0);
    m0.predict(t);
    m1.predict(t);
    this.mu[0] = c0;
    this.mu[1] = c1;
  }

  update(m: Measurement): number {
    const comb = this.estimate();
    const nx = m.x - comb.x;
    const ny = m.y - comb.y;
    const sxx = comb.pxx + m.rxx;
    const sxy = comb.pxy + m.rxy;
    const syy = comb.pyy + m.ryy;
    const nis = (nx * nx * syy - 2 * nx * ny * sxy + ny * ny * sxx) / (sxx * syy - sxy * sxy);
    const f0 = this.models[0];
    const f1 = this.models[1];
    f0.update(m);
    f1.update(m);
    // Gaussian likelihoods N(ν; 0, S) of each model; the common 1/2π cancels in the ratio.
    const u0 = (Math.exp(-0.5 * f0.lastNis) / Math.sqrt(f0.lastDetS)) * this.mu[0];
    const u1 = (Math.exp(-0.5 * f1.lastNis) / Math.sqrt(f1.lastDetS)) * this.mu[1];
    const sum = u0 + u1;
    if (sum > 0 && Number.isFinite(sum)) {
      this.mu[0] = Math.min(Math.max(u0 / sum, 1e-6), 1 - 1e-6);
      this.mu[1] = 1 - this.mu[0];
    }
    return nis;
  }

  estimate(): FilterEstimate {
    // Written out (no destructuring, no spread): this runs several times per detection.
    const a = this.models[0];
    const b = this.models[1];
    const wa = this.mu[0];
    const wb = this.mu[1];
    const xa = a.x;
    const xb = b.x;
    const x = wa * xa[0] + wb * xb[0];
    const y = wa * xa[2] + wb * xb[2];
    const ax = xa[0] - x;
    const ay = xa[2] - y;
    const bx = xb[0] - x;
    const by = xb[2] - y;
    return {
      x,
      y,
      vx: wa * xa[1] + wb * xb[1],
      vy: wa * xa[3] + wb * xb[3],
      pxx: wa * (a.P[0] + ax * ax) + wb * (b.P[0] + bx * bx),
      pxy: wa * (a.P[2] + ax * ay) + wb * (b.P[2] + bx * by),
      pyy: wa * (a.P[10] + ay * ay) + wb * (b.P[10] + by * by),
    };
  }
}

/** Moment-matched combination of two position estimates with weights wa + wb = 1. */
function combine(a: PositionPrediction, b: PositionPrediction, wa: number, wb: number): PositionPrediction {
  const x = wa * a.x + wb * b.x;
  const y = wa * a.y + wb * b.y;
  const ax = a.x - x;
  const ay = a.y - y;
  const bx = b.x - x;
  const by = b.y - y;
  return {
    x,
    y,
    pxx: wa * (a.pxx + ax * ax) + wb * (b.pxx + bx * bx),
    pxy: wa * (a.pxy + ax * ay) + wb * (b.pxy + bx * by),
    pyy: wa * (a.pyy + ay * ay) + wb * (b.pyy + by * by),
  };
}
