/**
 * Two-level uniform grid over the plane for gating. Each entry sits in exactly one cell — of the
 * fine level when its reach (gate radius) is at most one fine cell, else of the coarse level
 * (4 fine cells wide; reaches beyond that are capped) — and a query looks at the 3×3 block of
 * cells around the point on both levels. Moving an entry is O(1), and the cost of a query depends
 * on how crowded the neighbourhood is, not on how many entries exist.
 */

const COARSE = 4;

export class SpatialGrid {
  private readonly fine = new Map<number, Set<number>>();
  private readonly coarse = new Map<number, Set<number>>();
  /** id → level·2³⁰ + cell key, to find and move entries. */
  private readonly where = new Map<number, number>();
  private readonly inv: number;
  private readonly out: number[] = [];

  /** @param cellM fine cell edge, metres; entries reach at most 4·cellM */
  constructor(readonly cellM: number) {
    this.inv = 1 / cellM;
  }

  /** 15 bits per axis (±16384 cells) keeps the key a small integer: V8 hashes those without allocating. */
  private static key(ix: number, iy: number): number {
    return (((ix + 16384) & 0x7fff) << 15) | ((iy + 16384) & 0x7fff);
  }

  /** Largest reach an entry can have, metres. */
  get maxReachM(): number {
    return COARSE * this.cellM;
  }

  /** Places `id` so that queries within `reachM` (Chebyshev distance) of (x, y) find it. */
  set(id: number, x: number, y: number, reachM: number): void {
    const coarse = reachM > this.cellM;
    const s = coarse ? this.inv / COARSE : this.inv;
    const k = SpatialGrid.key(Math.floor(x * s), Math.floor(y * s));
    const code = coarse ? k + 0x40000000 : k;
    const old = this.where.get(id);
    if (old === code) return;
    if (old !== undefined) this.detach(id, old);
    const map = coarse ? this.coarse : this.fine;
    const cell = map.get(k);
    if (cell) cell.add(id);
    else map.set(k, new Set([id]));
    this.where.set(id, code);
  }

  private detach(id: number, code: number): void {
    const coarse = code >= 0x40000000;
    const k = coarse ? code - 0x40000000 : code;
    const map = coarse ? this.coarse : this.fine;
    const cell = map.get(k)!;
    cell.delete(id);
    if (cell.size === 0) map.delete(k);
  }

  remove(id: number): void {
    const code = this.where.get(id);
    if (code === undefined) return;
    this.detach(id, code);
    this.where.delete(id);
  }

  /**
   * Ids that may reach (x, y): a superset of those within their reach. The array is reused by the
   * next call: consume it before querying again.
   */
  query(x: number, y: number): readonly number[] {
    const out = this.out;
    out.length = 0;
    this.collect(this.fine, x * this.inv, y * this.inv);
    if (this.coarse.size) this.collect(this.coarse, (x * this.inv) / COARSE, (y * this.inv) / COARSE);
    return out;
  }

  private collect(map: Map<number, Set<number>>, fx: number, fy: number): void {
    const ix = Math.floor(fx);
    const iy = Math.floor(fy);
    for (let a = -1; a <= 1; a++) {
      for (let b = -1; b <= 1; b++) {
        const cell = map.get(SpatialGrid.key(ix + a, iy + b));
        if (cell) for (const id of cell) this.out.push(id);
      }
    }
  }

  get size(): number {
    return this.where.size;
  }
}
