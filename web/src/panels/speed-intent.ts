/**
 * The replay speed the keys are stepping towards. `[` and `]` step from the speed last asked
 * for, not from the speed the bridge last reported: three quick presses of `]` before the bridge
 * has answered must climb three steps (1× → 2× → 5× → 10×), not ask for 2× three times. Once the
 * bridge reports the asked speed, or after a while without it (a refused request), the bridge's
 * value counts again.
 */
import { nextSpeed } from './shortcuts.ts';

/** How long an unanswered request is trusted over the bridge's reported speed, ms. */
const PATIENCE_MS = 1500;

export class SpeedIntent {
  private wanted: number | null = null;
  private askedAt = 0;

  /** The speed to ask for after one step in `direction` from `reported` (or from the pending request). */
  step(reported: number, direction: 1 | -1, nowMs: number): number {
    const from = this.wanted !== null && nowMs - this.askedAt < PATIENCE_MS ? this.wanted : reported;
    this.wanted = nextSpeed(from, direction);
    this.askedAt = nowMs;
    return this.wanted;
  }

  /** The bridge's replay state arrived: a request it has carried out is settled. */
  reported(speed: number): void {
    if (this.wanted !== null && Math.abs(speed - this.wanted) < 1e-9) this.wanted = null;
  }
}
