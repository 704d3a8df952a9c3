import { describe, expect, it } from 'vitest';
import { chunkRanges, needsRestroke, windowStartFor } from '../../web/src/plan/trail-chunks.ts';

describe('trail chunk ranges', () => {
  it('splits a window into chunks that share their joining point', () => {
    expect(chunkRanges(0, 600, 256)).toEqual([
      { index: 0, from: 0, to: 256 },
      { index: 1, from: 256, to: 512 },
      { index: 2, from: 512, to: 599 },
    ]);
  });

  it('clips the oldest chunk to the window and drops chunks before it', () => {
    const r = chunkRanges(300, 600, 256);
    expect(r[0]).toEqual({ index: 1, from: 300, to: 512 });
    expect(r.map((c) => c.index)).toEqual([1, 2]);
  });

  it('has nothing to draw with fewer than two points', () => {
    expect(chunkRanges(0, 1, 256)).toEqual([]);
    expect(chunkRanges(5, 6, 256)).toEqual([]);
  });

  it('in steady streaming, only the newest chunk needs stroking again', () => {
    const before = chunkRanges(1000, 3000, 256);
    const after = chunkRanges(1001, 3001, 256);
    const drawn = new Map(before.map((c) => [c.index, { from: c.from, to: c.to }]));
    const restroke = after.filter((c) => needsRestroke(drawn.get(c.index), c, 32)).map((c) => c.index);
    expect(restroke).toEqual([after[after.length - 1].index]);
  });

  it('restrokes the oldest chunk once the window has moved past the slack', () => {
    expect(needsRestroke({ from: 1000, to: 1024 }, { index: 3, from: 1020, to: 1024 }, 32)).toBe(false);
    expect(needsRestroke({ from: 1000, to: 1024 }, { index: 3, from: 1020, to: 1024 }, 16)).toBe(true);
    // the newest point moved: always redraw
    expect(needsRestroke({ from: 1000, to: 1024 }, { index: 3, from: 1000, to: 1025 }, 32)).toBe(true);
    expect(needsRestroke(undefined, { index: 0, from: 0, to: 5 }, 32)).toBe(true);
  });

  it('turns a trail length in seconds into a start sequence, keeping one point before it', () => {
    const times = Array.from({ length: 100 }, (_, i) => i * 0.1); // seq == index here
    const seqAt = (t: number) => { const i = times.findIndex((x) => x >= t - 1e-9); return i < 0 ? times.length : i; };
    expect(windowStartFor(0, seqAt, 9.9, 2)).toBe(78);
    expect(windowStartFor(0, seqAt, 9.9, Infinity)).toBe(0);
    expect(windowStartFor(50, seqAt, 9.9, 100)).toBe(50);
  });
});
