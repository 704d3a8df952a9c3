/**
 * Uniform grid over the plane for gating. Each track registers in every cell its gate can reach,
 * and a detection looks only in its own cell, so the cost per detection depends on how crowded
 * the neighbourhood is, not on how many tracks exist.
 */

export class SpatialGrid {
  private readonly cells = new Map<number, number[]>();
  private readonly keysOf = new Map<number, number[]>();
  private readonly inv: number;

  /**
   * @param cellM cell edge, metres
   * @param maxReachCells a registration never spans more than this many cells from its centre
   */
  constructor(
    readonly cellM: number,
    private readonly maxReachCells = 6,
  ) {
    this.inv = 1 / cellM;
  }

  private static key(ix: number, iy: number): number {
    return (ix + 1048576) * 2097152 + (iy + 1048576);
  }

  /** Registers `id` in the cells covering the square [x ± reach] × [y ± reach]. */
  set(id: number, x: number, y: number, reachM: number): void {
    this.remove(id);
    const cx = Math.floor(x * this.inv);
    const cy = Math.floor(y * this.inv);
    const rc = this.maxReachCells;
    const x0 = Math.max(Math.floor((x - reachM) * this.inv), cx - rc);
    const x1 = Math.min(Math.floor((x + reachM) * this.inv), cx + rc);
    const y0 = Math.max(Math.floor((y - reachM) * this.inv), cy - rc);
    const y1 = Math.min(Math.floor((y + reachM) * this.inv), cy + rc);
    const keys: number[] = [];
    for (let ix = x0; ix <= x1; ix++) {
      for (let iy = y0; iy <= y1; iy++) {
        const k = SpatialGrid.key(ix, iy);
        const cell = this.cells.get(k);
        if (cell) cell.push(id);
        else this.cells.set(k, [id]);
        keys.push(k);
      }
    }
    this.keysOf.set(id, keys);
  }

  remove(id: number): void {
    const keys = this.keysOf.get(id);
    if (!keys) return;
    for (const k of keys) {
      const cell = this.cells.get(k)!;
      const i = cell.indexOf(id);
      cell[i] = cell[cell.length - 1];
      cell.pop();
      if (cell.length === 0) this.cells.delete(k);
    }
    this.keysOf.delete(id);
  }

  /** Ids registered in the cell containing (x, y); do not keep or modify the array. */
  query(x: number, y: number): readonly number[] {
    return this.cells.get(SpatialGrid.key(Math.floor(x * this.inv), Math.floor(y * this.inv))) ?? EMPTY;
  }

  get size(): number {
    return this.keysOf.size;
  }
}

const EMPTY: readonly number[] = [];
