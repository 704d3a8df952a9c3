/**
 * Where each track's id label goes: the first of four spots around its symbol (upper right,
 * upper left, lower right, lower left) that does not overlap a label already placed or another
 * symbol. Greedy, in the order given (the caller puts the selected track first). When all four
 * collide the label still goes upper right: an id partly overlapped is better than none.
 */
export interface LabelBox { x: number; y: number; w: number; h: number }

const GAP = 8;
const SYMBOL_R = 7;

export function placeLabels(points: readonly { px: number; py: number; w: number; h: number }[]): LabelBox[] {
  const placed: LabelBox[] = [];
  const symbols: LabelBox[] = points.map((p) => ({ x: p.px - SYMBOL_R, y: p.py - SYMBOL_R, w: 2 * SYMBOL_R, h: 2 * SYMBOL_R }));
  return points.map((p, i) => {
    const spots: LabelBox[] = [
      { x: p.px + GAP, y: p.py - GAP - p.h, w: p.w, h: p.h },
      { x: p.px - GAP - p.w, y: p.py - GAP - p.h, w: p.w, h: p.h },
      { x: p.px + GAP, y: p.py + GAP, w: p.w, h: p.h },
      { x: p.px - GAP - p.w, y: p.py + GAP, w: p.w, h: p.h },
    ];
    const free = spots.find((s) => !placed.some((o) => overlaps(s, o)) && !symbols.some((o, j) => j !== i && overlaps(s, o)));
    const box = free ?? spots[0];
    placed.push(box);
    return box;
  });
}

export function overlaps(a: LabelBox, b: LabelBox): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}
