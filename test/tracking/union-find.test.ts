import { describe, expect, it } from 'vitest';
import { UnionFind, detectionKey, trackKey } from '../../bridge/tracking/union-find.ts';

describe('UnionFind', () => {
  it('groups gated pairs into independent clusters', () => {
    // Pairs (track, detection): 1–0, 2–0, 3–1, 4–2, 4–3 → clusters {1, 2, d0}, {3, d1}, {4, d2, d3}.
    const pairs: [number, number][] = [[1, 0], [2, 0], [3, 1], [4, 2], [4, 3]];
    const sets = new UnionFind();
    for (const [t, d] of pairs) sets.union(trackKey(t), detectionKey(d));
    const root = (t: number) => sets.find(trackKey(t));
    expect(root(1)).toBe(root(2));
    expect(root(1)).toBe(sets.find(detectionKey(0)));
    expect(root(3)).not.toBe(root(1));
    expect(root(4)).toBe(sets.find(detectionKey(3)));
    expect(new Set([1, 2, 3, 4].map(root)).size).toBe(3);
    // A key never joined is its own set.
    expect(sets.find(trackKey(99))).toBe(trackKey(99));
  });
});
