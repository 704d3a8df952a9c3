/**
 * Alpha-beta filter: fixed gains, or gains from Kalata's tracking index (Kalata 1984, IEEE Trans.
 * AES 20(2)). Without a covariance of its own, the gate uses the steady-state Kalman covariance
 * that the same gains imply: predicted position variance P⁻ = R·α/(1 − α) (from K = P⁻/(P⁻ + R)).
 */
import type { Measurement } from '../types.ts';
import { discOf, gateAgainst, mahalanobis2, type FilterEstimate, type GateDisc, type GateResult, type PositionPrediction, type TrackFilter } from './filter-types.ts';
import { EchotrailError } from '../errors.ts';

/** Kalata's tracking index λ = σ_w·T²/σ_v (σ_w process acceleration std, σ_v measurement std). */
export function trackingIndex(sigmaW: number, T: number, sigmaV: number): number {
  return (sigmaW * T * T) / sigmaV;
}

/** α and β from the tracking index (Kalata 1984): r = (4 + λ − √(λ² + 8λ))/4, α = 1 − r², β = 2(2 − α) − 4√(1 − α). */
export function kalataGains(lambda: number): { alpha: number; beta: number } {
  if (!(lambda > 0)) throw new EchotrailError('E_OPTION', 'tracking index must be positive');
  const r = (4 + lambda - Math.sqrt(lambda * lambda + 8 * lambda)) / 4;
  const alpha = 1 - r * r;
  const beta = 2 * (2 - alpha) - 4 * Math.sqrt(1 - alpha);
  return { alpha, beta };
}

/** True when 0 < α < 2 and 0 < β < 4 − 2α (stability region, Brookner 1998). */
export function alphaBetaStable(alpha: number, beta: number): boolean {
  return alpha > 0 && alpha < 2 && beta > 0 && beta < 4 - 2 * alpha;
}

export class AlphaBetaFilter implements TrackFilter {
  timeS: number;
  private x: number;
  private y: number;
  private vx = 0;
  private vy = 0;
  private r: number;
  private readonly ratio: number;
  private n = 1;
  private lastUpdateS: number;

  constructor(m: Measurement, private readonly alpha: number, private readonly beta: number) {
    if (!alphaBetaStable(alpha, beta) || alpha >= 1) {
      throw new EchotrailError('E_OPTION', `alpha-beta gains α=${alpha}, β=${beta} are outside 0<α<1, 0<β<4−2α`);
    }
    this.timeS = m.timeS;
    this.lastUpdateS = m.timeS;
    this.x = m.x;
    this.y = m.y;
    this.r = 0.5 * (m.rxx + m.ryy);
    this.ratio = alpha / (1 - alpha);
  }

  peek(t: number): PositionPrediction {
    const dt = t - this.timeS;
    // Until the velocity has been seen twice the gate must also admit the unknown velocity.
    const p = this.n < 2 ? this.r * 50 : this.r * this.ratio;
    return { x: this.x + this.vx * dt, y: this.y + this.vy * dt, pxx: p, pxy: 0, pyy: p };
  }

  predict(t: number): void {
    const dt = t - this.timeS;
    this.x += this.vx * dt;
    this.y += this.vy * dt;
    this.timeS = t;
  }

  update(m: Measurement): number {
    const rx = m.x - this.x;
    const ry = m.y - this.y;
    const pred = this.peek(m.timeS);
    const nis = mahalanobis2(rx, ry, pred.pxx + m.rxx, pred.pxy + m.rxy, pred.pyy + m.ryy);
    const dt = Math.max(m.timeS - this.lastUpdateS, 1e-9);
    this.lastUpdateS = m.timeS;
    if (this.n === 1) {
      // Two-point start: velocity from the first difference.
      this.vx = rx / dt;
      this.vy = ry / dt;
      this.x = m.x;
      this.y = m.y;
    } else {
      this.x += this.alpha * rx;
      this.y += this.alpha * ry;
      this.vx += (this.beta / dt) * rx;
      this.vy += (this.beta / dt) * ry;
    }
    this.r = 0.5 * (m.rxx + m.ryy);
    this.n++;
    return nis;
  }

  gateDisc(t: number, gamma: number, rMax: number, out: GateDisc): GateDisc {
    return discOf(this.peek(t), gamma, rMax, out);
  }

  gate(m: Measurement): GateResult {
    return gateAgainst(this.peek(m.timeS), m);
  }

  estimate(): FilterEstimate {
    const p = this.r * this.alpha;
    return { x: this.x, y: this.y, vx: this.vx, vy: this.vy, pxx: p, pxy: 0, pyy: p };
  }
}
