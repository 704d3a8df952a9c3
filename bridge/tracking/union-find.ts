/**
 * Disjoint sets over sparse integer keys, with path compression: groups the gated
 * track–detection pairs of a batch into independent clusters, so that each cluster's assignment
 * is solved on its own (small) cost matrix. Tracks are keyed 2·id and detections 2·j + 1, so
 * that both share one key space (see `trackKey`, `detectionKey`).
 */
export const trackKey = (id: number): number => 2 * id;
export const detectionKey = (j: number): number => 2 * j + 1;

export class UnionFind {
  private readonly parent = new Map<number, number>();

  /** The representative of `a`'s set (a itself when never joined). */
  find(a: number): number {
    let r = a;
    for (let p = this.parent.get(r); p !== undefined && p !== r; p = this.parent.get(r)) r = p;
    // Path compression: later look-ups of the same keys take one step.
    for (let c = a; c !== r; ) {
      const n = this.parent.get(c)!;
      this.parent.set(c, r);
      c = n;
    }
    return r;
  }

  /** Joins the sets of `a` and `b`. */
  union(a: number, b: number): void {
    if (!this.parent.has(a)) this.parent.set(a, a);
    if (!this.parent.has(b)) this.parent.set(b, b);
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra !== rb) this.parent.set(ra, rb);
  }
}
