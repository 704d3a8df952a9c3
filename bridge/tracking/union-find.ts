/**
 * Clusters of gated pairs: tracks and detections linked by gates, found with a disjoint-set
 * forest (union by size, path halving) over dense indices in typed arrays. A contested cluster
 * waits for the beam as a whole (sweep-deferral.ts).
 *
 * Why dense indices: a batch has a few thousand pairs and this runs for every batch held back, so
 * the keyed maps of a general union-find were a tenth of the tracker's time.
 */

/** One gated (track, detection) pair, as far as clustering is concerned. */
export interface PairLink {
  track: number;
  det: number;
}

export interface PairClusters {
  /** Cluster of each pair, 0..count−1, numbered in order of first appearance. */
  label: Int32Array;
  count: number;
  /** Local index of each pair's track, 0..tracks.length−1. */
  trackIndex: Int32Array;
  /** Track id of each local index, in order of first appearance. */
  tracks: number[];
}

/** Groups `pairs` (detections numbered 0..nDet−1) into clusters linked by a shared track or detection. */
export function clusterPairs(pairs: readonly PairLink[], nDet: number): PairClusters {
  const n = pairs.length;
  const local = new Map<number, number>();
  const tracks: number[] = [];
  const trackIndex = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const id = pairs[i].track;
    let k = local.get(id);
    if (k === undefined) {
      k = tracks.length;
      local.set(id, k);
      tracks.push(id);
    }
    trackIndex[i] = k;
  }
  // Nodes: detections 0..nDet−1, then tracks.
  const nodes = nDet + tracks.length;
  const parent = new Int32Array(nodes);
  const weight = new Int32Array(nodes).fill(1);
  for (let v = 0; v < nodes; v++) parent[v] = v;
  const find = (v: number): number => {
    while (parent[v] !== v) {
      parent[v] = parent[parent[v]];
      v = parent[v];
    }
    return v;
  };
  for (let i = 0; i < n; i++) {
    let a = find(pairs[i].det);
    let b = find(nDet + trackIndex[i]);
    if (a === b) continue;
    if (weight[a] < weight[b]) {
      const s = a;
      a = b;
      b = s;
    }
    parent[b] = a;
    weight[a] += weight[b];
  }
  const labelOf = new Int32Array(nodes).fill(-1);
  const label = new Int32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    const r = find(pairs[i].det);
    if (labelOf[r] < 0) labelOf[r] = count++;
    label[i] = labelOf[r];
  }
  return { label, count, trackIndex, tracks };
}
