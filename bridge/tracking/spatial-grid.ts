/**
 * Uniform grid over the plane for gating, in two levels. Each entry is written into every cell
 * that its reach square (centre ± reach, Chebyshev) overlaps — on the fine level when its reach is
 * at most FINE_SPAN fine cells, else on the coarse level (COARSE fine cells wide) — and a query
 * reads the one cell under the point on each level. An entry reaching farther than the coarse
 * level's span (a track coasting for long) goes on a list that every query returns.
 *
 * Why write many cells and read one: an entry moves once per scan while every detection queries,
 * several per track and scan, and a query that reads a 3×3 block returns every entry within three
 * cells, most of them far outside their gates. Reading one cell returns only entries whose reach
 * square overlaps that cell, so the gate test that follows runs on few candidates. An entry whose
 * covered block of cells is unchanged (a slow target, the usual case) is not rewritten at all.
 */

/** Reach, in fine cells, up to which an entry stays on the fine level (at most 7×7 cells). */
const FINE_SPAN = 3;
/** Coarse cell edge, in fine cells. */
const COARSE = 4;

/** Where an entry is written: its level and the block of cells it covers (inclusive). */
interface Placement {
  /** 0 fine, 1 coarse, 2 the everywhere list. */
  level: 0 | 1 | 2;
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

export class SpatialGrid<T = number> {
  private readonly fine = new Map<number, T[]>();
  private readonly coarse = new Map<number, T[]>();
  private readonly everywhere: T[] = [];
  private readonly where = new Map<T, Placement>();
  private readonly inv: number;
  private readonly out: T[] = [];

  /** @param cellM fine cell edge, metres */
  constructor(readonly cellM: number) {
    this.inv = 1 / cellM;
  }

  /** 15 bits per axis (±16384 cells) keeps the key a small integer: V8 hashes those without allocating. */
  private static key(ix: number, iy: number): number {
    return (((ix + 16384) & 0x7fff) << 15) | ((iy + 16384) & 0x7fff);
  }

  /** Largest reach kept in cells, metres; an entry reaching farther is returned by every query. */
  get maxReachM(): number {
    return COARSE * FINE_SPAN * this.cellM;
  }

  /**
   * Places `id` so that queries within `reachM` (Chebyshev distance) of (x, y) find it. A block
   * that must be rewritten is written a quarter cell wider than needed, so that the small moves
   * of the next updates stay inside it.
   */
  set(id: T, x: number, y: number, reachM: number): void {
    const r = Math.max(reachM, 0);
    const level = r <= FINE_SPAN * this.cellM ? 0 : r <= this.maxReachM ? 1 : 2;
    const s = level === 0 ? this.inv : this.inv / COARSE;
    const flat = level === 2;
    const x0 = flat ? 0 : Math.floor((x - r) * s);
    const y0 = flat ? 0 : Math.floor((y - r) * s);
    const x1 = flat ? 0 : Math.floor((x + r) * s);
    const y1 = flat ? 0 : Math.floor((y + r) * s);
    const old = this.where.get(id);
    // Still covered by the block written before, and that block not much wider: nothing to
    // rewrite. Entries move a little at every update; this keeps most updates free.
    if (old && old.level === level && old.x0 <= x0 && old.y0 <= y0 && old.x1 >= x1 && old.y1 >= y1 && old.x1 - old.x0 <= x1 - x0 + 2 && old.y1 - old.y0 <= y1 - y0 + 2) return;
    const pad = flat ? 0 : r + 0.25 / s;
    const p: Placement = old ?? { level, x0, y0, x1, y1 };
    if (old) this.detach(id, old);
    else this.where.set(id, p);
    p.level = level;
    p.x0 = flat ? 0 : Math.floor((x - pad) * s);
    p.y0 = flat ? 0 : Math.floor((y - pad) * s);
    p.x1 = flat ? 0 : Math.floor((x + pad) * s);
    p.y1 = flat ? 0 : Math.floor((y + pad) * s);
    this.attach(id, p);
  }

  private attach(id: T, p: Placement): void {
    if (p.level === 2) {
      this.everywhere.push(id);
      return;
    }
    const map = p.level === 1 ? this.coarse : this.fine;
    for (let ix = p.x0; ix <= p.x1; ix++) {
      for (let iy = p.y0; iy <= p.y1; iy++) {
        const k = SpatialGrid.key(ix, iy);
        const cell = map.get(k);
        if (cell) cell.push(id);
        else map.set(k, [id]);
      }
    }
  }

  private detach(id: T, p: Placement): void {
    if (p.level === 2) {
      removeFrom(this.everywhere, id);
      return;
    }
    const map = p.level === 1 ? this.coarse : this.fine;
    for (let ix = p.x0; ix <= p.x1; ix++) {
      for (let iy = p.y0; iy <= p.y1; iy++) {
        const k = SpatialGrid.key(ix, iy);
        const cell = map.get(k)!;
        if (cell.length === 1) map.delete(k);
        else removeFrom(cell, id);
      }
    }
  }

  remove(id: T): void {
    const p = this.where.get(id);
    if (!p) return;
    this.detach(id, p);
    this.where.delete(id);
  }

  /**
   * Ids that may reach (x, y): a superset of those within their reach (whole cells). The array
   * is reused by the next call: consume it before querying again.
   */
  query(x: number, y: number): readonly T[] {
    const out = this.out;
    out.length = 0;
    const f = this.fine.get(SpatialGrid.key(Math.floor(x * this.inv), Math.floor(y * this.inv)));
    if (f) for (let i = 0; i < f.length; i++) out.push(f[i]);
    if (this.coarse.size) {
      const s = this.inv / COARSE;
      const c = this.coarse.get(SpatialGrid.key(Math.floor(x * s), Math.floor(y * s)));
      if (c) for (let i = 0; i < c.length; i++) out.push(c[i]);
    }
    for (let i = 0; i < this.everywhere.length; i++) out.push(this.everywhere[i]);
    return out;
  }

  /**
   * Point-like entries (placed with reach 0) whose cell overlaps the square (x ± r, y ± r): every
   * entry within Chebyshev distance r, possibly twice (a padded entry sits in up to four cells),
   * plus some farther ones. For a query whose reach the query sets (the fixed-echo map: the gate
   * there depends on the detection's noise): it reads as few cells as the reach needs, however
   * wide that is.
   */
  queryAround(x: number, y: number, r: number): readonly T[] {
    const out = this.out;
    out.length = 0;
    const inv = this.inv;
    const x0 = Math.floor((x - r) * inv);
    const x1 = Math.floor((x + r) * inv);
    const y0 = Math.floor((y - r) * inv);
    const y1 = Math.floor((y + r) * inv);
    for (let ix = x0; ix <= x1; ix++) {
      for (let iy = y0; iy <= y1; iy++) {
        const f = this.fine.get(SpatialGrid.key(ix, iy));
        if (f) for (let i = 0; i < f.length; i++) out.push(f[i]);
      }
    }
    return out;
  }

  get size(): number {
    return this.where.size;
  }
}

/** Removes one occurrence of `id`; order within a cell carries no meaning, so the last fills the hole. */
function removeFrom<T>(cell: T[], id: T): void {
  const i = cell.indexOf(id);
  cell[i] = cell[cell.length - 1];
  cell.pop();
}
