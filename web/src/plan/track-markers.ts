/**
 * Current position, velocity vector and id label of every track, in screen space so symbols keep
 * their size at any zoom. Status is carried by shape (disc confirmed, ring tentative, diamond
 * coasting) and every symbol has its id written beside it: colour is never the only cue.
 */
import { Container, Graphics, Text } from 'pixi.js';
import type { TrackEntry } from '../stream/state.ts';
import { cssColour, selectionColour, shapeFor, trackColour } from './palette.ts';
import { type View, toScreen } from './view.ts';
import { placeLabels } from './label-placement.ts';

/** The velocity vector shows where the target will be in this many seconds. */
export const VECTOR_LOOKAHEAD_S = 1;

export class TrackMarkers {
  readonly container = new Container();
  private readonly shapes = new Graphics();
  private readonly labels = new Map<number, Text>();
  /** Screen positions from the last update, for picking. */
  readonly screen = new Map<number, { px: number; py: number }>();

  constructor() {
    this.container.addChild(this.shapes);
  }

  update(view: View, tracks: Map<number, TrackEntry>, selectedId: number | null, hoverId: number | null): void {
    const g = this.shapes.clear();
    this.screen.clear();
    for (const [id, label] of this.labels) {
      if (!tracks.has(id)) { label.destroy(); this.labels.delete(id); }
    }
    for (const t of tracks.values()) {
      const w = t.latest;
      const p = toScreen(view, w.x, w.y);
      this.screen.set(t.id, p);
      const colour = trackColour(t.id);
      const tip = toScreen(view, w.x + w.vx * VECTOR_LOOKAHEAD_S, w.y + w.vy * VECTOR_LOOKAHEAD_S);
      if (Math.hypot(tip.px - p.px, tip.py - p.py) > 3) drawArrow(g, p.px, p.py, tip.px, tip.py, colour);
      const shape = shapeFor(w.status);
      if (shape === 'disc') g.circle(p.px, p.py, 6).fill({ color: colour }).stroke({ width: 1.5, color: 0x0c1116 });
      else if (shape === 'ring') g.circle(p.px, p.py, 6).stroke({ width: 2, color: colour });
      else g.poly([p.px, p.py - 7, p.px + 7, p.py, p.px, p.py + 7, p.px - 7, p.py], true).stroke({ width: 2, color: colour });
      if (t.id === selectedId) g.circle(p.px, p.py, 12).stroke({ width: 2, color: selectionColour });
      else if (t.id === hoverId) g.circle(p.px, p.py, 11).stroke({ width: 1, color: selectionColour, alpha: 0.6 });
    }
    this.placeAllLabels(selectedId);
  }

  /** Labels avoid each other and other symbols; the selected track gets first choice. */
  private placeAllLabels(selectedId: number | null): void {
    const ids = [...this.screen.keys()].sort((a, b) => (a === selectedId ? -1 : b === selectedId ? 1 : a - b));
    const labels = ids.map((id) => this.label(id, trackColour(id)));
    const boxes = placeLabels(ids.map((id, i) => ({ ...this.screen.get(id)!, w: labels[i].width, h: labels[i].height })));
    boxes.forEach((b, i) => labels[i].position.set(Math.round(b.x), Math.round(b.y)));
  }

  /** Nearest track symbol within `radiusPx`, or null. */
  pick(px: number, py: number, radiusPx = 14): number | null {
    let best: number | null = null;
    let bestD = radiusPx;
    for (const [id, p] of this.screen) {
      const d = Math.hypot(p.px - px, p.py - py);
      if (d <= bestD) { bestD = d; best = id; }
    }
    return best;
  }

  private label(id: number, colour: number): Text {
    let t = this.labels.get(id);
    if (!t) {
      t = new Text({
        text: `T${id}`,
        style: { fontFamily: 'system-ui, sans-serif', fontSize: 13, fontWeight: '600', fill: cssColour(colour),
          stroke: { color: 0x0c1116, width: 3 } },
      });
      this.labels.set(id, t);
      this.container.addChild(t);
    }
    return t;
  }
}

function drawArrow(g: Graphics, x0: number, y0: number, x1: number, y1: number, colour: number): void {
  const a = Math.atan2(y1 - y0, x1 - x0);
  const head = 7;
  g.moveTo(x0, y0).lineTo(x1, y1)
    .moveTo(x1, y1).lineTo(x1 - head * Math.cos(a - 0.45), y1 - head * Math.sin(a - 0.45))
    .moveTo(x1, y1).lineTo(x1 - head * Math.cos(a + 0.45), y1 - head * Math.sin(a + 0.45))
    .stroke({ width: 2, color: colour });
}
