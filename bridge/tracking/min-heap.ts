/**
 * Binary min-heap of values on a numeric key (a time): push and pop cost log n. The tracker keeps
 * held detections on their release times and tracks on the end of their gate discs in one.
 */
export class MinHeap<T> {
  private readonly keys: number[] = [];
  private readonly values: T[] = [];

  get size(): number {
    return this.keys.length;
  }

  /** Smallest key held (Infinity when empty). */
  get minKey(): number {
    return this.keys.length ? this.keys[0] : Infinity;
  }

  push(key: number, value: T): void {
    const a = this.keys;
    const vs = this.values;
    let i = a.length;
    a.push(key);
    vs.push(value);
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
    const a = this.keys;
    const vs = this.values;
    if (a.length === 0) return undefined;
    const top = vs[0];
    const lastA = a.pop()!;
    const lastV = vs.pop()!;
    const n = a.length;
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
    this.keys.length = 0;
    return this.values.splice(0);
  }
}
