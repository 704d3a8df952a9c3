/**
 * Global-nearest-neighbour assignment of detections to tracks.
 *
 * The gated pairs form a sparse bipartite graph, solved exactly by shortest augmenting paths
 * (sparse-assignment.ts). Each track may instead take its own "missed" column at the miss cost,
 * so a track may take no detection and more detections than tracks stays feasible.
 * The tests check it against the Hungarian method (npm `munkres`) on the same problems written
 * densely (test/helpers/dense-assignment.ts).
 */
import { solveSparse } from './sparse-assignment.ts';

/** One gated (track, detection) pair and its cost (lower is better). */
export interface GatedPair {
  track: number;
  det: number;
  cost: number;
  /** Outside the gate of the track's most probable model (only a manoeuvre model admits it). */
  unlikely?: boolean;
}

/**
 * Assigns over all gated pairs: the global nearest neighbour, optimal over the whole batch.
 * `missCost(track)` is the price of leaving a track without a detection. Returns the pairs
 * [track, det] chosen, in the order of the tracks' first pairs.
 *
 * Solved as one sparse problem (sparse-assignment.ts): its cost follows the conflicts, so the
 * large clusters of a crowded scan — hundreds of tracks linked by overlapping gates — are solved
 * exactly too, where a dense solver per cluster would be cubic in the cluster size.
 */
export function assign(pairs: readonly GatedPair[] | GatedPair[], missCost: (track: number) => number): Array<[number, number]> {
  if (pairs.length === 0) return [];
  // Tracks as rows in order of first appearance; a pair dearer than its track's miss is never
  // part of an optimum (the miss is cheaper and frees the detection), so it is left out.
  const rowOf = new Map<number, number>();
  const tracks: number[] = [];
  const miss: number[] = [];
  let nDet = 0;
  const keep: number[] = [];
  const rowOfPair = new Int32Array(pairs.length);
  for (let k = 0; k < pairs.length; k++) {
    const p = pairs[k];
    let r = rowOf.get(p.track);
    if (r === undefined) {
      r = tracks.length;
      rowOf.set(p.track, r);
      tracks.push(p.track);
      miss.push(missCost(p.track));
    }
    rowOfPair[k] = r;
    if (p.cost > miss[r]) continue;
    keep.push(k);
    if (p.det >= nDet) nDet = p.det + 1;
  }
  const rows = tracks.length;
  const rowStart = new Int32Array(rows + 1);
  for (const k of keep) rowStart[rowOfPair[k] + 1]++;
  for (let r = 0; r < rows; r++) rowStart[r + 1] += rowStart[r];
  const fill = rowStart.slice(0, rows);
  const edgeCol = new Int32Array(keep.length);
  const edgeCost = new Float64Array(keep.length);
  for (const k of keep) {
    const p = pairs[k];
    const e = fill[rowOfPair[k]]++;
    edgeCol[e] = p.det;
    edgeCost[e] = p.cost;
  }
  const sol = solveSparse({ rows, cols: nDet, rowStart, edgeCol, edgeCost, missCost: Float64Array.from(miss) });
  const result: Array<[number, number]> = [];
  for (let r = 0; r < rows; r++) if (sol[r] >= 0) result.push([tracks[r], sol[r]]);
  return result;
}
