import { describe, expect, it } from 'vitest';
import { MinHeap } from '../../bridge/tracking/min-heap.ts';
import { createRng } from '../../bridge/sim/prng.ts';

describe('MinHeap', () => {
  it('pops values in key order (against a sort)', () => {
    const rng = createRng(5);
    const h = new MinHeap<number>();
    const keys: number[] = [];
    for (let i = 0; i < 500; i++) {
      const k = Math.floor(rng.between(0, 100));
      keys.push(k);
      h.push(k, k);
    }
    expect(h.size).toBe(500);
    expect(h.minKey).toBe(Math.min(...keys));
    const out: number[] = [];
    for (let v = h.pop(); v !== undefined; v = h.pop()) out.push(v);
    expect(out).toEqual(keys.sort((a, b) => a - b));
    expect(h.minKey).toBe(Infinity);
  });

  it('clear() hands back everything and empties the heap', () => {
    const h = new MinHeap<string>();
    h.push(2, 'b');
    h.push(1, 'a');
    expect(h.clear().sort()).toEqual(['a', 'b']);
    expect(h.size).toBe(0);
    expect(h.pop()).toBeUndefined();
  });

  it('reset() empties it and it works again, in order, over many fill-and-empty rounds', () => {
    const rng = createRng(8);
    const h = new MinHeap<number>();
    for (let round = 0; round < 50; round++) {
      const keys: number[] = [];
      const n = 1 + Math.floor(rng.between(0, 40));
      for (let i = 0; i < n; i++) {
        const k = rng.between(-5, 5);
        keys.push(k);
        h.push(k, i);
      }
      // Take a few, then drop the rest, as the sparse assignment does once per row.
      const take = Math.min(n, 3);
      const sorted = [...keys].sort((a, b) => a - b);
      for (let i = 0; i < take; i++) {
        expect(h.minKey).toBe(sorted[i]);
        expect(keys[h.pop()!]).toBe(sorted[i]);
      }
      h.reset();
      expect(h.size).toBe(0);
      expect(h.minKey).toBe(Infinity);
    }
  });
});
