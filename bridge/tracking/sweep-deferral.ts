/**
 * Which detections must wait before they are assigned (rotating antenna, live mode).
 *
 * Live, each detection is assigned as it comes, so that its update leaves at once; but a track
 * whose gate reaches beyond the beam may still get a better detection from the part of the sweep
 * not yet seen (two targets crossing: the beam reaches one just before the other). So every
 * cluster of gated pairs (tracks and detections linked by gates) that holds a track whose gate
 * still lies ahead of the beam is held, whole, until the beam has swept past those gates (the
 * tracker keeps held detections in its release queue, release-queue.ts, and assigns them with
 * whatever arrived meanwhile); global nearest neighbour then sees the cluster complete, as it would
 * in a batch of a whole revolution. Only contested clusters wait (see heldBack): a lone
 * established track takes a detection its likely model expects at once, so most updates leave
 * with their own detection.
 */
import type { GatedPair } from './assignment.ts';
import type { Track } from './track-life.ts';
import { lambdaMax } from './filter-types.ts';
import { clusterPairs } from './union-find.ts';

const TWO_PI = 2 * Math.PI;

/**
 * Times a detection may be held and released again before its cluster waits out its longest wait
 * in one go. With 800 targets around the antenna, clusters kept growing as the beam found new
 * contenders, and each detection was gated 9 times on average before it was decided (3.4 with
 * 100 targets in one sector): the live mode's cost per detection grew ×2.5 between the two. With
 * a limit of 4 each is gated 2.6 and 3.1 times, and the demo scenarios (6 × 10 seeded runs) give
 * exactly the same tracks (with 2, a third more off-target rows).
 */
export const REHOLD_LIMIT = 4;

/** Angle a − b wrapped into (−π, π]. */
function wrap(a: number): number {
  let d = a % TWO_PI;
  if (d > Math.PI) d -= TWO_PI;
  else if (d <= -Math.PI) d += TWO_PI;
  return d;
}

/**
 * Run time at which the beam will have swept past the gate of `t` (radius
 * √(γ·(λmax(P) + λmax(R)))), given that it points at `beamAz` at `nowS` and turns once per
 * `periodS`; `nowS` when it already has, Infinity when the antenna is inside the gate.
 */
export function gateSweptS(t: Track, nowS: number, beamAz: number, gamma: number, periodS: number): number {
  const p = t.filter.peek(Math.max(nowS, t.filter.timeS));
  const radius = Math.sqrt(gamma * (lambdaMax(p.pxx, p.pxy, p.pyy) + t.lastRMax));
  const r = Math.sqrt(p.x * p.x + p.y * p.y);
  if (r <= radius) return Infinity;
  const ahead = wrap(Math.atan2(p.x, p.y) + Math.asin(radius / r) - beamAz);
  return ahead > 0 ? nowS + (ahead / TWO_PI) * periodS : nowS;
}

/**
 * Release time of each detection to hold back (NaN: decide now): the detections of a contested
 * cluster of `pairs` (two tracks or more, a tentative track, or a pair only a manoeuvre model
 * admits; see the module comment) with a gate the beam has not swept past yet, or with a track
 * already waiting (`waiting`: track → its cluster's release time). A cluster is released when
 * the beam has passed all its gates, but no later than `maxWaitS` after its oldest detection;
 * a cluster holding a detection already held `REHOLD_LIMIT` times (`timesHeld`, per detection)
 * waits for that latest release at once.
 */
export function heldBack(
  pairs: readonly GatedPair[],
  detTimes: ArrayLike<number>,
  live: ReadonlyMap<number, Track>,
  waiting: ReadonlyMap<number, number>,
  nowS: number,
  beamAz: number,
  gamma: number,
  periodS: number,
  maxWaitS: number,
  timesHeld?: ArrayLike<number>,
): Float64Array {
  const release = new Float64Array(detTimes.length).fill(NaN);
  if (pairs.length === 0) return release;
  if (detTimes.length === 1) {
    // One detection (the usual batch): its pairs are one cluster, no union-find needed.
    const first = pairs[0].track;
    let contested = false;
    for (const p of pairs) {
      if (p.track !== first || p.unlikely || (waiting.get(p.track) ?? -Infinity) > nowS || live.get(p.track)!.status === 'tentative') contested = true;
    }
    if (!contested) return release;
    let swept = -Infinity;
    for (const p of pairs) swept = Math.max(swept, waitingUntil(waiting, p.track, nowS) ?? gateSweptS(live.get(p.track)!, nowS, beamAz, gamma, periodS));
    const r = Math.min(swept, detTimes[0] + maxWaitS);
    if (r > nowS) release[0] = r;
    return release;
  }
  const c = clusterPairs(pairs, detTimes.length);
  const n = c.count;
  const firstTrack = new Int32Array(n).fill(-1);
  const contested = new Uint8Array(n);
  const swept = new Float64Array(n).fill(-Infinity);
  const oldest = new Float64Array(n).fill(Infinity);
  const reheld = new Uint8Array(n);
  const sweptOf = new Float64Array(c.tracks.length).fill(NaN);
  for (let i = 0; i < pairs.length; i++) {
    const p = pairs[i];
    const k = c.label[i];
    const ti = c.trackIndex[i];
    const t = live.get(p.track)!;
    if (firstTrack[k] < 0) firstTrack[k] = ti;
    else if (firstTrack[k] !== ti) contested[k] = 1;
    // A tentative track has not learned its velocity: its wide gate may yet reach the detection
    // that continues it, later in the sweep. Nor is a detection that only the manoeuvre model
    // admits convincing: the detection the track expects may come a few degrees later.
    if (t.status === 'tentative' || p.unlikely) contested[k] = 1;
    const w = waitingUntil(waiting, p.track, nowS);
    if (w !== undefined) contested[k] = 1;
    let s = sweptOf[ti];
    if (Number.isNaN(s)) {
      s = w ?? gateSweptS(t, nowS, beamAz, gamma, periodS);
      sweptOf[ti] = s;
    }
    if (s > swept[k]) swept[k] = s;
    if (detTimes[p.det] < oldest[k]) oldest[k] = detTimes[p.det];
    if (timesHeld && timesHeld[p.det] >= REHOLD_LIMIT) reheld[k] = 1;
  }
  for (let i = 0; i < pairs.length; i++) {
    const k = c.label[i];
    if (!contested[k]) continue;
    // A cluster that keeps growing as the beam finds new contenders would be released and held
    // again every few detections, its detections gated anew each time: once one of them has
    // waited REHOLD_LIMIT times, the cluster waits out its longest wait in one go.
    const r = reheld[k] ? oldest[k] + maxWaitS : Math.min(swept[k], oldest[k] + maxWaitS);
    if (r > nowS) release[pairs[i].det] = r;
  }
  return release;
}

/** The release time a track waits for, if still ahead of `nowS` (entries expire lazily). */
function waitingUntil(waiting: ReadonlyMap<number, number>, id: number, nowS: number): number | undefined {
  const w = waiting.get(id);
  return w !== undefined && w > nowS ? w : undefined;
}
