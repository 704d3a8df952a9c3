/**
 * M-of-N track confirmation (Blackman & Popoli 1999, §3.2): a tentative track is confirmed once it
 * has M hits within its last N scans, and dropped once that has become impossible.
 */
import { EchotrailError } from '../errors.ts';

export interface InitiationOptions {
  /** Hits needed to confirm. */
  m: number;
  /** Window of scans for the hits. */
  n: number;
  /** Fastest target speed expected, m/s: the reach of a seed, and a bound on every track's gate (no detection farther from its last hit than this speed covers, plus noise). */
  maxSpeedMps: number;
}

export function resolveInitiationOptions(o: Partial<InitiationOptions> = {}): InitiationOptions {
  const r = { m: o.m ?? 3, n: o.n ?? 4, maxSpeedMps: o.maxSpeedMps ?? 1.5 };
  if (!Number.isInteger(r.m) || !Number.isInteger(r.n) || r.m < 1 || r.n < r.m || r.n > 30) {
    throw new EchotrailError('E_OPTION', `M-of-N needs integers 1 ≤ M ≤ N ≤ 30, got ${r.m} of ${r.n}`);
  }
  if (!(r.maxSpeedMps > 0)) throw new EchotrailError('E_OPTION', 'maximum speed must be positive (m/s)');
  return r;
}

/** Sliding window of scan outcomes (bit i = scan i ago), starting with the initiating hit. */
export class MofN {
  private bits = 1;
  private len = 1;

  constructor(
    private readonly m: number,
    private readonly n: number,
  ) {}

  record(hit: boolean): void {
    const mask = (1 << this.n) - 1;
    this.bits = ((this.bits << 1) | (hit ? 1 : 0)) & mask;
    this.len = Math.min(this.len + 1, this.n);
  }

  hits(): number {
    let c = 0;
    for (let b = this.bits; b; b &= b - 1) c++;
    return c;
  }

  /** M hits within the window. */
  confirmed(): boolean {
    return this.hits() >= this.m;
  }

  /** Not confirmed and no way left to reach M hits within the first N scans. */
  failed(): boolean {
    return !this.confirmed() && this.hits() + (this.n - this.len) < this.m;
  }
}

/** P(at least m successes in n Bernoulli(p) trials), the binomial tail. */
export function probabilityAtLeast(m: number, n: number, p: number): number {
  let s = 0;
  for (let k = m; k <= n; k++) s += binom(n, k) * p ** k * (1 - p) ** (n - k);
  return s;
}

function binom(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}
