import { describe, expect, it } from 'vitest';
import { clusterPairs } from '../../bridge/tracking/union-find.ts';
import { createRng } from '../../bridge/sim/prng.ts';

describe('clusterPairs', () => {
  it('groups gated pairs into independent clusters', () => {
    // Pairs (track, detection): 1–0, 2–0, 3–1, 4–2, 4–3 → clusters {1, 2, d0}, {3, d1}, {4, d2, d3}.
    const pairs = [[1, 0], [2, 0], [3, 1], [4, 2], [4, 3]].map(([track, det]) => ({ track, det }));
    const c = clusterPairs(pairs, 4);
    expect(c.count).toBe(3);
    expect([...c.label]).toEqual([0, 0, 1, 2, 2]);
    expect(c.tracks).toEqual([1, 2, 3, 4]);
    expect([...c.trackIndex]).toEqual([0, 1, 2, 3, 3]);
  });

  it('agrees with connected components found by graph search (random pairs)', () => {
    const rng = createRng(9);
    for (let rep = 0; rep < 20; rep++) {
      const nDet = 40;
      const pairs = Array.from({ length: 60 }, () => ({ track: 100 + Math.floor(rng.between(0, 30)), det: Math.floor(rng.between(0, nDet)) }));
      const c = clusterPairs(pairs, nDet);
      // Reference: flood fill over the bipartite graph.
      const comp = new Map<string, number>();
      let next = 0;
      for (const start of pairs) {
        const key = `t${start.track}`;
        if (comp.has(key)) continue;
        const stack = [key];
        comp.set(key, next);
        while (stack.length) {
          const v = stack.pop()!;
          for (const p of pairs) {
            const [a, b] = [`t${p.track}`, `d${p.det}`];
            if (a !== v && b !== v) continue;
            for (const w of [a, b]) if (!comp.has(w)) (comp.set(w, next), stack.push(w));
          }
        }
        next++;
      }
      expect(c.count).toBe(next);
      for (let i = 0; i < pairs.length; i++) {
        for (let j = 0; j < pairs.length; j++) {
          expect(c.label[i] === c.label[j]).toBe(comp.get(`t${pairs[i].track}`) === comp.get(`t${pairs[j].track}`));
        }
      }
    }
  });
});
