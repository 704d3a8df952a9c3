/**
 * Global-nearest-neighbour assignment of detections to tracks.
 *
 * The gated pairs form a bipartite graph; each connected cluster is solved on its own with the
 * Hungarian method (Kuhn 1955, Munkres 1957, npm `munkres`), so the cost stays small even with
 * hundreds of tracks: a cluster is usually one track and one detection. Each track row is padded
 * with its own "missed" column at the miss cost, so a track may take no detection and more
 * detections than tracks stays feasible.
 */
import munkres from 'munkres';
import { clusterPairs, pairsByCluster } from './union-find.ts';

/** One gated (track, detection) pair and its cost (lower is better). */
export interface GatedPair {
  track: number;
  det: number;
  cost: number;
  /** Outside the gate of the track's most probable model (only a manoeuvre model admits it). */
  unlikely?: boolean;
}

const FORBIDDEN = 1e12;

/** Solves one dense problem: cost[t][d]; returns the column of each row or −1 for "missed". */
export function solveDense(cost: number[][], missCost: number[]): number[] {
  const nt = cost.length;
  if (nt === 0) return [];
  const nd = cost[0].length;
  const m: number[][] = [];
  for (let i = 0; i < nt; i++) {
    const row = new Array<number>(nd + nt).fill(FORBIDDEN);
    for (let j = 0; j < nd; j++) row[j] = cost[i][j];
    row[nd + i] = missCost[i];
    m.push(row);
  }
  const out = new Array<number>(nt).fill(-1);
  for (const [r, c] of munkres(m)) if (c < nd && m[r][c] < FORBIDDEN) out[r] = c;
  return out;
}

/**
 * Assigns over all gated pairs. `missCost(track)` is the price of leaving a track without a
 * detection. Returns pairs [track, det] chosen. A cluster with more than `maxCluster` tracks is
 * solved greedily (cheapest pair first) instead: the Hungarian method is cubic, and such clusters
 * only arise among tentative tracks in dense clutter, where an exact optimum buys nothing.
 */
export function assign(pairs: readonly GatedPair[] | GatedPair[], missCost: (track: number) => number, maxCluster = Infinity): Array<[number, number]> {
  if (pairs.length === 0) return [];
  const result: Array<[number, number]> = [];
  let nDet = 0;
  for (const p of pairs) if (p.det >= nDet) nDet = p.det + 1;
  const clusters = clusterPairs(pairs, nDet);
  // A pair whose track and detection appear in no other pair is a cluster of its own, the usual
  // case: decided at once, in pair order; then the larger clusters in order of appearance.
  for (let i = 0; i < pairs.length; i++) {
    const p = pairs[i];
    if (clusters.size[clusters.label[i]] === 1 && p.cost <= missCost(p.track)) result.push([p.track, p.det]);
  }
  for (const members of pairsByCluster(clusters)) {
    if (members.length === 1) continue;
    const c = Array.from(members, (i) => pairs[i]);
    const tIdx = new Map<number, number>();
    const dIdx = new Map<number, number>();
    for (const p of c) {
      if (!tIdx.has(p.track)) tIdx.set(p.track, tIdx.size);
      if (!dIdx.has(p.det)) dIdx.set(p.det, dIdx.size);
    }
    if (tIdx.size > maxCluster) {
      greedy(c, missCost, result);
      continue;
    }
    const cost = Array.from({ length: tIdx.size }, () => new Array<number>(dIdx.size).fill(FORBIDDEN));
    for (const p of c) cost[tIdx.get(p.track)!][dIdx.get(p.det)!] = p.cost;
    const tracks = [...tIdx.keys()];
    const dets = [...dIdx.keys()];
    const sol = solveDense(cost, tracks.map(missCost));
    sol.forEach((col, row) => {
      if (col >= 0) result.push([tracks[row], dets[col]]);
    });
  }
  return result;
}

/** Cheapest-first assignment of one cluster. */
function greedy(c: GatedPair[], missCost: (track: number) => number, result: Array<[number, number]>): void {
  const usedT = new Set<number>();
  const usedD = new Set<number>();
  // A pair dearer than its track's miss is never taken: leave it out before sorting.
  const worth = c.filter((p) => p.cost <= missCost(p.track));
  for (const p of worth.sort((a, b) => a.cost - b.cost)) {
    if (usedT.has(p.track) || usedD.has(p.det)) continue;
    usedT.add(p.track);
    usedD.add(p.det);
    result.push([p.track, p.det]);
  }
}
