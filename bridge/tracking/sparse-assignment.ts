/**
 * Optimal assignment on a sparse bipartite graph: rows (tracks) to columns (detections), where
 * each row may also take a private "miss" column at its own price, and a column left over costs
 * nothing. The gated pairs of a crowded scan form a few large clusters (hundreds of tracks, a few
 * gated detections each): a dense solver on them is cubic in the cluster size, so the tracker
 * used to fall back on a greedy choice there, which is not the global nearest neighbour.
 *
 * Method: successive shortest augmenting paths with dual potentials, one row at a time — the
 * algorithm of Crouse (2016, "On implementing 2D rectangular assignment algorithms", IEEE Trans.
 * Aerospace and Electronic Systems 52(4); cited from memory), the form SciPy's
 * `linear_sum_assignment` implements — with Dijkstra run over each visited row's
 * own edges only, the frontier kept in a binary heap. Every row reaches its own free miss column,
 * so a search stops within the row's neighbourhood: the cost follows the size of the conflicts,
 * not of the cluster.
 *
 * Negative costs are fine: only the edges out of the row being added can have a negative reduced
 * cost, and Dijkstra starts there; the duals keep every other edge's reduced cost ≥ 0.
 */

import { MinHeap } from './min-heap.ts';

/** A sparse problem in compressed-row form. */
export interface SparseProblem {
  rows: number;
  /** Number of real columns (detections), 0..cols−1. */
  cols: number;
  /** Row r's edges are rowStart[r] .. rowStart[r+1]−1. */
  rowStart: Int32Array;
  /** Column of each edge. */
  edgeCol: Int32Array;
  /** Cost of each edge. */
  edgeCost: Float64Array;
  /** Price of each row taking no column. */
  missCost: Float64Array;
}

/**
 * Working arrays, kept between calls and grown as needed: the tracker solves two problems per
 * batch, and allocating a dozen arrays of the batch's size each time was a tenth of its garbage.
 */
class Scratch {
  size = 0;
  u = new Float64Array(0);
  v = new Float64Array(0);
  col4row = new Int32Array(0);
  row4col = new Int32Array(0);
  dist = new Float64Array(0);
  path = new Int32Array(0);
  scanned = new Uint8Array(0);
  /** Columns given a distance this round, columns scanned, rows visited (each at most `size`). */
  touched = new Int32Array(0);
  scannedCols = new Int32Array(0);
  visitedRows = new Int32Array(0);
  readonly heap = new MinHeap<number>();

  /** Room for `n` columns (rows ≤ columns here: every row has its own miss column). */
  reserve(n: number): void {
    if (n <= this.size) return;
    const size = Math.max(n, 2 * this.size, 64);
    this.size = size;
    this.u = new Float64Array(size);
    this.v = new Float64Array(size);
    this.col4row = new Int32Array(size);
    this.row4col = new Int32Array(size);
    this.dist = new Float64Array(size).fill(Infinity);
    this.path = new Int32Array(size);
    this.scanned = new Uint8Array(size);
    this.touched = new Int32Array(size);
    this.scannedCols = new Int32Array(size);
    this.visitedRows = new Int32Array(size);
  }
}

const scratch = new Scratch();

/** Column taken by each row (−1: its miss column), minimising the total cost. */
export function solveSparse(p: SparseProblem): Int32Array {
  const { rows, cols, rowStart, edgeCol, edgeCost, missCost } = p;
  // Columns 0..cols−1 are real; column cols + r is row r's miss column.
  const nc = cols + rows;
  scratch.reserve(nc);
  const { u, v, col4row, row4col, dist, path, scanned, touched, scannedCols, visitedRows, heap } = scratch;
  // dist and scanned are left clean by every round (the touched list); the rest starts afresh.
  u.fill(0, 0, rows);
  v.fill(0, 0, nc);
  col4row.fill(-1, 0, rows);
  row4col.fill(-1, 0, nc);

  for (let cur = 0; cur < rows; cur++) {
    let minVal = 0;
    let i = cur;
    let sink = -1;
    let nVisited = 0;
    let nTouched = 0;
    let nScanned = 0;
    heap.reset();
    for (;;) {
      // Relax row i's edges, then (one step past its last edge) its own miss column, by the
      // reduced cost minVal + c − u[i] − v[j].
      const base = minVal - u[i];
      for (let e = rowStart[i]; e <= rowStart[i + 1]; e++) {
        const miss = e === rowStart[i + 1];
        const c = miss ? cols + i : edgeCol[e];
        if (scanned[c]) continue;
        const rc = base + (miss ? missCost[i] : edgeCost[e]) - v[c];
        if (rc < dist[c]) {
          if (dist[c] === Infinity) touched[nTouched++] = c;
          dist[c] = rc;
          path[c] = i;
          heap.push(rc, c);
        }
      }
      // Nearest column not yet scanned (stale heap entries skipped).
      let j = -1;
      while (heap.size) {
        const key = heap.minKey;
        const c = heap.pop()!;
        if (!scanned[c] && key === dist[c]) {
          j = c;
          break;
        }
      }
      // Unreachable: the row's own miss column is always a free column.
      if (j < 0) {
        // Only a NaN miss cost gets here; the working arrays are mid-round: start afresh next time.
        scratch.size = 0;
        throw new Error('sparse assignment: no augmenting path (a miss cost is not a number)');
      }
      minVal = dist[j];
      scanned[j] = 1;
      scannedCols[nScanned++] = j;
      if (row4col[j] === -1) {
        sink = j;
        break;
      }
      i = row4col[j];
      visitedRows[nVisited++] = i;
    }
    // Dual update (as in Crouse's algorithm), then flip the path.
    u[cur] += minVal;
    for (let k = 0; k < nVisited; k++) u[visitedRows[k]] += minVal - dist[col4row[visitedRows[k]]];
    for (let k = 0; k < nScanned; k++) v[scannedCols[k]] -= minVal - dist[scannedCols[k]];
    for (let j = sink; ; ) {
      const r = path[j];
      row4col[j] = r;
      const prev = col4row[r];
      col4row[r] = j;
      if (r === cur) break;
      j = prev;
    }
    for (let k = 0; k < nTouched; k++) {
      dist[touched[k]] = Infinity;
      scanned[touched[k]] = 0;
    }
  }
  const out = new Int32Array(rows);
  for (let r = 0; r < rows; r++) out[r] = col4row[r] < cols ? col4row[r] : -1;
  return out;
}
