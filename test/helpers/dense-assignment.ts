/**
 * The reference for the tracker's sparse assignment: the Hungarian method (Kuhn 1955, Munkres
 * 1957) as implemented by the npm package `munkres`, on a dense cost matrix padded with one
 * "missed" column per row at that row's miss cost.
 */
import munkres from 'munkres';

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

