/**
 * χ² gate on d² = νᵀS⁻¹ν with S = HPHᵀ + R. The threshold is the χ² quantile for the gate
 * probability P_G and the measurement dimension (2: x, y).
 */
import quantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { EchotrailError } from '../errors.ts';

export interface GateOptions {
  /** Gate probability P_G: chance that a true detection falls inside the gate, 0 < P_G < 1. */
  probability: number;
}

export function resolveGateOptions(o: Partial<GateOptions> = {}): GateOptions {
  const probability = o.probability ?? 0.99;
  if (!(probability > 0 && probability < 1)) {
    throw new EchotrailError('E_OPTION', `gate probability must be between 0 and 1 (exclusive), got ${probability}`);
  }
  return { probability };
}

/** χ² quantile γ with P(d² ≤ γ) = P_G for `dof` degrees of freedom. */
export function gateThreshold(probability: number, dof = 2): number {
  const g = quantile(probability, dof);
  if (!Number.isFinite(g)) throw new EchotrailError('E_OPTION', `no gate threshold for P_G=${probability}, dof=${dof}`);
  return g;
}
