import { describe, expect, it } from 'vitest';
import { overlaps, placeLabels } from '../../web/src/plan/label-placement.ts';

describe('placeLabels', () => {
  it('puts a lone label upper right of its symbol', () => {
    expect(placeLabels([{ px: 100, py: 100, w: 30, h: 16 }])).toEqual([{ x: 108, y: 76, w: 30, h: 16 }]);
  });

  it('moves the second of two close tracks to a free spot, so no labels overlap', () => {
    const pts = [{ px: 100, py: 100, w: 30, h: 16 }, { px: 110, py: 100, w: 30, h: 16 }, { px: 105, py: 110, w: 30, h: 16 }];
    const boxes = placeLabels(pts);
    for (let i = 0; i < boxes.length; i++) for (let j = i + 1; j < boxes.length; j++) expect(overlaps(boxes[i], boxes[j])).toBe(false);
  });

  it('falls back to upper right when everything collides', () => {
    const pts = Array.from({ length: 6 }, () => ({ px: 50, py: 50, w: 30, h: 16 }));
    expect(placeLabels(pts)[5]).toEqual({ x: 58, y: 26, w: 30, h: 16 });
  });
});
