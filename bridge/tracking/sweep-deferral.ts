/**
 * Which detections of a short batch must wait for the next one (rotating antenna).
 *
 * Batches are short sectors of the sweep so that updates leave soon after their detections; but
 * a track whose gate reaches beyond the beam may still get a better detection from the part of the
 * sweep not yet seen (two targets crossing: the beam reaches one just before the other). So every
 * cluster of gated pairs (tracks and detections linked by gates) that holds a track whose gate
 * still lies ahead of the beam waits, whole, for the next batch; global nearest neighbour then
 * sees the cluster complete, as it did when a batch was a whole revolution. Only established
 * tracks (confirmed, coasting) count, and clusters of one track do not wait (see heldBack):
 * tentative tracks take what the established ones leave, whenever that is settled.
 */
import type { GatedPair } from './assignment.ts';
import type { Track } from './track-life.ts';
import { lambdaMax } from './track-life.ts';

const TWO_PI = 2 * Math.PI;

/** Angle a − b wrapped into (−π, π]. */
function wrap(a: number): number {
  let d = a % TWO_PI;
  if (d > Math.PI) d -= TWO_PI;
  else if (d <= -Math.PI) d += TWO_PI;
  return d;
}

/**
 * True when the gate of `t` (radius √(γ·(λmax(P) + λmax(R)))) reaches azimuths clockwise of
 * `beamAz`, the azimuth the beam has reached at `nowS`.
 */
export function gateAhead(t: Track, nowS: number, beamAz: number, gamma: number): boolean {
  const p = t.filter.peek(Math.max(nowS, t.filter.timeS));
  const radius = Math.sqrt(gamma * (lambdaMax(p.pxx, p.pxy, p.pyy) + t.lastRMax));
  const r = Math.hypot(p.x, p.y);
  if (r <= radius) return true;
  return wrap(Math.atan2(p.x, p.y) + Math.asin(radius / r) - beamAz) > 0;
}

/**
 * Marks (1) the detections to hold back: those in a cluster of `pairs` (of established tracks)
 * with two tracks or more, one of whose gates is
 * ahead of the beam. Detections older than `maxWaitS` at `nowS` are never held back (a gate
 * wider than the sweep it waits for, close to the antenna, must not hold its cluster for ever),
 * and neither is the rest of their cluster.
 */
export function heldBack(
  pairs: readonly GatedPair[],
  detTimes: ArrayLike<number>,
  live: ReadonlyMap<number, Track>,
  nowS: number,
  beamAz: number,
  gamma: number,
  maxWaitS: number,
): Uint8Array {
  const held = new Uint8Array(detTimes.length);
  if (pairs.length === 0) return held;
  // Union-find over nodes: tracks as 2·id, detections as 2·j + 1.
  const parent = new Map<number, number>();
  const find = (a: number): number => {
    let r = a;
    for (let p = parent.get(r); p !== undefined && p !== r; p = parent.get(r)) r = p;
    return r;
  };
  for (const p of pairs) {
    const a = 2 * p.track;
    const b = 2 * p.det + 1;
    if (!parent.has(a)) parent.set(a, a);
    if (!parent.has(b)) parent.set(b, b);
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent.set(ra, rb);
  }
  // A cluster waits when one of its tracks looks ahead, unless one of its detections is too old.
  const ahead = new Map<number, boolean>();
  const aheadRoot = new Set<number>();
  const oldRoot = new Set<number>();
  for (const p of pairs) {
    const root = find(2 * p.track);
    if (nowS - detTimes[p.det] > maxWaitS) oldRoot.add(root);
    if (aheadRoot.has(root)) continue;
    let a = ahead.get(p.track);
    if (a === undefined) {
      a = gateAhead(live.get(p.track)!, nowS, beamAz, gamma);
      ahead.set(p.track, a);
    }
    if (a) aheadRoot.add(root);
  }
  // Only clusters of two tracks or more: a track alone takes the best detection it has seen so
  // far at once (waiting for the beam would hold the last target before an empty sector of the
  // room until the next detection arrives, up to a revolution later).
  const firstTrack = new Map<number, number>();
  const shared = new Set<number>();
  for (const p of pairs) {
    const root = find(2 * p.track);
    const f = firstTrack.get(root);
    if (f === undefined) firstTrack.set(root, p.track);
    else if (f !== p.track) shared.add(root);
    // A tentative track has not learned its velocity: its wide gate may yet reach the detection
    // that continues it, later in the sweep.
    if (live.get(p.track)!.status === 'tentative') shared.add(root);
    // Nor is a detection that only the manoeuvre model admits convincing: the detection the
    // track expects may come a few degrees later.
    if (p.unlikely) shared.add(root);
  }
  for (const p of pairs) {
    const root = find(2 * p.track);
    if (shared.has(root) && aheadRoot.has(root) && !oldRoot.has(root)) held[p.det] = 1;
  }
  return held;
}
