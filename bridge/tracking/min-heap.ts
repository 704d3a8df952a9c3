/**
 * Binary min-heap of values on a numeric key (a time, a distance): push and pop cost log n. The
 * tracker keeps held detections on their release times and tracks on the end of their gate discs
 * in one; the sparse assignment keeps columns on their tentative distances in another.
 *
 * The arrays keep their room when the heap empties (`reset`), so a heap that is filled and
 * emptied thousands of times per batch (the assignment's, once per row) allocates nothing after
 * the first rounds.
 */
export class MinHeap<T> {
  private keys = new Float64Array(16);
  private readonly values: (T | undefined)[] = [];
  private n = 0;

  get size(): number {
    return this.n;
  }

  /** Smallest key held (Infinity when empty). */
  get minKey(): number {
    return this.n ? this.keys[0] : Infinity;
  }

  push(key: number, value: T): void {
    if (this.n === this.keys.length) {
      const grown = new Float64Array(2 * this.n);
      grown.set(this.keys);
      this.keys = grown;
    }
    const a = this.keys;
    const vs = this.values;
    let i = this.n++;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (a[p] <= key) break;
      a[i] = a[p];
      vs[i] = vs[p];
      i = p;
    }
    a[i] = key;
    vs[i] = value;
  }

  /** Removes and returns the value of the smallest key (undefined when empty). */
  pop(): T | undefined {
    if (this.n === 0) return undefined;
    const a = this.keys;
    const vs = this.values;
    const top = vs[0];
    const n = --this.n;
    const lastA = a[n];
    const lastV = vs[n];
    // Let go of the moved slot's reference: a popped track or detection must not stay reachable.
    vs[n] = undefined;
    if (n > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= n) break;
        const c = l + 1 < n && a[l + 1] < a[l] ? l + 1 : l;
        if (a[c] >= lastA) break;
        a[i] = a[c];
        vs[i] = vs[c];
        i = c;
      }
      a[i] = lastA;
      vs[i] = lastV;
    }
    return top;
  }

  /** Removes and returns every value, in no particular order. */
  clear(): T[] {
    const out = this.values.slice(0, this.n) as T[];
    this.reset();
    return out;
  }

  /** Empties the heap, keeping its room. */
  reset(): void {
    this.values.fill(undefined, 0, this.n);
    this.n = 0;
  }
}
