import { describe, expect, it } from 'vitest';
import { SpatialGrid } from '../../bridge/tracking/spatial-grid.ts';
import { createRng } from '../../bridge/sim/prng.ts';

describe('SpatialGrid', () => {
  it('finds every registration whose reach square covers the query point (against brute force)', () => {
    const rng = createRng(4);
    const g = new SpatialGrid(0.5);
    const items = new Map<number, { x: number; y: number; r: number }>();
    for (let id = 0; id < 300; id++) {
      const it = { x: rng.between(-10, 10), y: rng.between(-10, 10), r: rng.between(0, 2) };
      items.set(id, it);
      g.set(id, it.x, it.y, it.r);
    }
    // Move and remove some, as the tracker does.
    for (let id = 0; id < 100; id++) {
      const it = { x: rng.between(-10, 10), y: rng.between(-10, 10), r: rng.between(0, 2) };
      items.set(id, it);
      g.set(id, it.x, it.y, it.r);
    }
    for (let id = 100; id < 150; id++) {
      items.delete(id);
      g.remove(id);
    }
    expect(g.size).toBe(250);
    for (let q = 0; q < 2000; q++) {
      const x = rng.between(-11, 11);
      const y = rng.between(-11, 11);
      const found = new Set(g.query(x, y)); // copy: the array is reused
      for (const [id, it] of items) {
        // Inside the square of half-side r: must be found (the grid may return more: cell granularity).
        if (Math.abs(x - it.x) <= it.r && Math.abs(y - it.y) <= it.r) expect(found.has(id)).toBe(true);
      }
      for (const id of found) expect(items.has(id)).toBe(true);
    }
  });

  it('queryAround finds every point entry within the query reach, however wide (against brute force)', () => {
    const rng = createRng(9);
    const g = new SpatialGrid(0.5);
    const pts = new Map<number, { x: number; y: number }>();
    for (let id = 0; id < 400; id++) {
      const p = { x: rng.between(-5, 5), y: rng.between(-5, 5) };
      pts.set(id, p);
      g.set(id, p.x, p.y, 0);
    }
    // Move some a little (a candidate's running mean), as the fixed-echo map does.
    for (let id = 0; id < 100; id++) {
      const p = pts.get(id)!;
      p.x += rng.between(-0.2, 0.2);
      p.y += rng.between(-0.2, 0.2);
      g.set(id, p.x, p.y, 0);
    }
    let beyondOneCell = 0;
    for (let q = 0; q < 1000; q++) {
      const x = rng.between(-6, 6);
      const y = rng.between(-6, 6);
      // Reaches from a tenth of a cell to four cells: a wide gate at long range with a coarse encoder.
      const r = rng.between(0.05, 2);
      const found = new Set(g.queryAround(x, y, r));
      for (const [id, p] of pts) {
        if (Math.abs(x - p.x) <= r && Math.abs(y - p.y) <= r) {
          expect(found.has(id)).toBe(true);
          if (Math.max(Math.abs(x - p.x), Math.abs(y - p.y)) > 1) beyondOneCell++;
        }
      }
    }
    // The old fixed 3×3 block read reached only one cell (0.5 m) beyond the query's own cell.
    expect(beyondOneCell).toBeGreaterThan(100);
  });

  it('returns an entry that reaches beyond the coarse level everywhere, and moves entries without duplicates', () => {
    const g = new SpatialGrid(1);
    expect(g.maxReachM).toBe(12);
    g.set(1, 0.5, 0.5, 100);
    expect(g.query(4.4, 0.5)).toContain(1);
    expect(g.query(90, -90)).toContain(1);
    g.set(1, 0.5, 0.5, 10);
    expect(g.query(-9, 10)).toContain(1);
    expect(g.query(20, 0.5)).not.toContain(1);
    g.set(1, 10.5, 0.5, 0.2);
    expect(g.query(0.5, 0.5)).not.toContain(1);
    expect(g.query(10.5, 0.5).filter((i) => i === 1)).toHaveLength(1);
    expect(g.size).toBe(1);
  });

  it('reads one cell per level: an entry is not returned far outside its reach square', () => {
    const g = new SpatialGrid(1);
    g.set(1, 0.5, 0.5, 0.1); // with a quarter cell of slack, still only the fine cell [0, 1)²
    g.set(2, 0.5, 0.5, 2.5); // fine cells -3..3 on both axes
    expect(g.query(1.5, 0.5)).toEqual([2]);
    expect(g.query(0.5, 0.5).slice().sort()).toEqual([1, 2]);
    expect(g.query(4.5, 0.5)).toEqual([]);
    g.remove(2);
    expect(g.query(1.5, 0.5)).toEqual([]);
    expect(g.size).toBe(1);
  });
});
