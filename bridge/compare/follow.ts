/**
 * Which track follows the commanded path. The tracker may lose the reflector and start a new id,
 * or hold a second track nearby (a multipath ghost, a fixed echo), so the choice is made over time:
 * the followed track is the confirmed one closest to the commanded position, and it keeps that role
 * until it goes stale or another track is clearly closer (hysteresis stops flip-flopping between
 * two tracks of the same reflector). Used the same way offline and live.
 */
import type { TrackRow } from './track-rows.ts';

/** Tuning of the follower. */
export interface FollowOptions {
  /** A track further than this from the commanded position cannot take the role, metres. */
  gateM: number;
  /** The followed track is lost after this long without an update, seconds. */
  staleS: number;
  /** Another track must be this much closer than the followed one to take over, metres. */
  switchMarginM: number;
  /**
   * The followed track loses the role when it strays further than this, metres: a diverged track
   * no longer follows the target, and its rows would swamp every figure (and the lag search).
   */
  releaseM: number;
  /**
   * Time constant of the running distance each track is judged by, seconds (0: the latest update
   * only). A ghost that passes close to the command for one scan must not take over from the
   * track that has been on the target all along: a take-over needs sustained closeness.
   */
  memoryS: number;
}

/** Defaults in one place: a metre is several times the bench's position noise (common practice). */
export function resolveFollowOptions(o: Partial<FollowOptions> = {}): FollowOptions {
  const gateM = o.gateM ?? 1.0;
  return { gateM, staleS: o.staleS ?? 2.0, switchMarginM: o.switchMarginM ?? 0.2, releaseM: o.releaseM ?? 2 * gateM, memoryS: o.memoryS ?? 2.0 };
}

/** A change of the followed track id. */
export interface FollowSwitch {
  timeS: number;
  /** Previous id, null at the first pick-up. */
  from: number | null;
  to: number;
}

/** Incremental follower: offer rows in time order, it says which belong to the followed track. */
export class TrackFollower {
  private readonly o: FollowOptions;
  private current: number | null = null;
  private lastAcceptS = -Infinity;
  /** Per track: exponentially weighted distance to the command and the time of its latest row. */
  private readonly runDist = new Map<number, { d: number; t: number }>();
  /** Every change of the followed id, in time order. */
  readonly switches: FollowSwitch[] = [];
  /** Times the followed track strayed beyond releaseM and lost the role. */
  readonly releases: { timeS: number; id: number; distanceM: number }[] = [];

  constructor(options: Partial<FollowOptions> = {}) {
    this.o = resolveFollowOptions(options);
  }

  /** Id of the followed track, or null before one is found. */
  get currentId(): number | null {
    return this.current;
  }

  /** Offer one track row with the commanded position at its time; true when it is the followed track's. */
  offer(row: TrackRow, cmdX: number, cmdY: number): boolean {
    if (row.status === 'tentative') return false;
    const d = Math.hypot(row.x - cmdX, row.y - cmdY);
    const prev = this.runDist.get(row.id);
    // First-order low-pass over irregular update times: weight 1 − exp(−Δt/τ) on the new value.
    const w = prev === undefined || this.o.memoryS <= 0 ? 1 : 1 - Math.exp(-Math.max(0, row.timeS - prev.t) / this.o.memoryS);
    const run = prev === undefined ? d : prev.d + w * (d - prev.d);
    this.runDist.set(row.id, { d: run, t: row.timeS });
    if (row.id === this.current) {
      if (d > this.o.releaseM) {
        this.releases.push({ timeS: row.timeS, id: row.id, distanceM: d });
        this.current = null;
        return false;
      }
      this.lastAcceptS = row.timeS;
      return true;
    }
    if (d > this.o.gateM) return false;
    const stale = this.current === null || row.timeS - this.lastAcceptS > this.o.staleS;
    const currentDist = this.current === null ? Infinity : (this.runDist.get(this.current)?.d ?? Infinity);
    // A newcomer's running distance is a single value: judge it by the worse of that and now.
    if (stale || Math.max(run, d) + this.o.switchMarginM < currentDist) {
      this.switches.push({ timeS: row.timeS, from: this.current, to: row.id });
      this.current = row.id;
      this.lastAcceptS = row.timeS;
      return true;
    }
    return false;
  }

  /** Forget everything. */
  reset(): void {
    this.current = null;
    this.lastAcceptS = -Infinity;
    this.runDist.clear();
    this.switches.length = 0;
    this.releases.length = 0;
  }
}
