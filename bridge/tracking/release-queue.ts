/**
 * Detections held back until a release time (see sweep-deferral.ts), on a min-heap of that time:
 * taking what is due costs log n per detection, not a scan of everything held.
 */
import type { Detection } from '../types.ts';
import { MinHeap } from './min-heap.ts';

const byTime = (x: Detection, y: Detection) => x.timeS - y.timeS;

export class ReleaseQueue {
  private readonly heap = new MinHeap<Detection>();

  get size(): number {
    return this.heap.size;
  }

  /** Earliest release time held, s (Infinity when empty). */
  get next(): number {
    return this.heap.minKey;
  }

  push(d: Detection, releaseS: number): void {
    this.heap.push(releaseS, d);
  }

  /** Removes and appends to `out` every detection due at `nowS`, in time order. */
  takeDue(nowS: number, out: Detection[]): void {
    const start = out.length;
    while (this.heap.minKey <= nowS) out.push(this.heap.pop()!);
    if (out.length - start > 1) {
      const due = out.splice(start).sort(byTime);
      for (const d of due) out.push(d);
    }
  }

  /** Removes and returns everything, in time order. */
  drain(): Detection[] {
    return this.heap.clear().sort(byTime);
  }
}
