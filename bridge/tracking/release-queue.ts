/**
 * Detections held back until a release time (see sweep-deferral.ts), as a binary min-heap on
 * that time: taking what is due costs log n per detection, not a scan of everything held.
 */
import type { Detection } from '../types.ts';

export class ReleaseQueue {
  private readonly dets: Detection[] = [];
  private readonly at: number[] = [];

  get size(): number {
    return this.dets.length;
  }

  /** Earliest release time held, s (Infinity when empty). */
  get next(): number {
    return this.at.length ? this.at[0] : Infinity;
  }

  push(d: Detection, releaseS: number): void {
    const a = this.at;
    const ds = this.dets;
    let i = a.length;
    a.push(releaseS);
    ds.push(d);
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (a[p] <= releaseS) break;
      a[i] = a[p];
      ds[i] = ds[p];
      i = p;
    }
    a[i] = releaseS;
    ds[i] = d;
  }

  /** Removes and appends to `out` every detection due at `nowS`, in time order. */
  takeDue(nowS: number, out: Detection[]): void {
    const start = out.length;
    while (this.at.length && this.at[0] <= nowS) out.push(this.pop());
    if (out.length - start > 1) {
      const due = out.splice(start).sort((x, y) => x.timeS - y.timeS);
      for (const d of due) out.push(d);
    }
  }

  /** Removes and returns everything, in time order. */
  drain(): Detection[] {
    const all = this.dets.splice(0).sort((x, y) => x.timeS - y.timeS);
    this.at.length = 0;
    return all;
  }

  private pop(): Detection {
    const a = this.at;
    const ds = this.dets;
    const top = ds[0];
    const lastA = a.pop()!;
    const lastD = ds.pop()!;
    const n = a.length;
    if (n > 0) {
      let i = 0;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= n) break;
        const c = l + 1 < n && a[l + 1] < a[l] ? l + 1 : l;
        if (a[c] >= lastA) break;
        a[i] = a[c];
        ds[i] = ds[c];
        i = c;
      }
      a[i] = lastA;
      ds[i] = lastD;
    }
    return top;
  }
}
