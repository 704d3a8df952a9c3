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

/** Column taken by each row (−1: its miss column), minimising the total cost. */
export function solveSparse(p: SparseProblem): Int32Array {
  const { rows, cols, rowStart, edgeCol, edgeCost, missCost } = p;
  // Columns 0..cols−1 are real; column cols + r is row r's miss column.
  const nc = cols + rows;
  const u = new Float64Array(rows);
  const v = new Float64Array(nc);
  const col4row = new Int32Array(rows).fill(-1);
  const row4col = new Int32Array(nc).fill(-1);
  const dist = new Float64Array(nc).fill(Infinity);
  const path = new Int32Array(nc).fill(-1);
  const scanned = new Uint8Array(nc);
  const touched: number[] = [];
  const scannedCols: number[] = [];
  const visitedRows: number[] = [];
  const heap = new MinHeap<number>();

  for (let cur = 0; cur < rows; cur++) {
    let minVal = 0;
    let i = cur;
    let sink = -1;
    visitedRows.length = 0;
    scannedCols.length = 0;
    heap.clear();
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
          if (dist[c] === Infinity) touched.push(c);
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
      if (j < 0) throw new Error('sparse assignment: no augmenting path');
      minVal = dist[j];
      scanned[j] = 1;
      scannedCols.push(j);
      if (row4col[j] === -1) {
        sink = j;
        break;
      }
      i = row4col[j];
      visitedRows.push(i);
    }
    // Dual update (as in Crouse's algorithm), then flip the path.
    u[cur] += minVal;
    for (const r of visitedRows) u[r] += minVal - dist[col4row[r]];
    for (const c of scannedCols) v[c] -= minVal - dist[c];
    for (let j = sink; ; ) {
      const r = path[j];
      row4col[j] = r;
      const prev = col4row[r];
      col4row[r] = j;
      if (r === cur) break;
      j = prev;
    }
    for (const c of touched) {
      dist[c] = Infinity;
      scanned[c] = 0;
    }
    touched.length = 0;
  }
  const out = new Int32Array(rows);
  for (let r = 0; r < rows; r++) out[r] = col4row[r] < cols ? col4row[r] : -1;
  return out;
}
