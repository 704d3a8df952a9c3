/**
 * The baseline the benchmark compares against: the same picture (rings, spokes, every trail
 * point, detections, track symbols and vectors) redrawn from scratch into one Graphics on every
 * frame. This is the straightforward way to draw a plan, and what the cached layers avoid.
 */
import { type Application, Graphics } from 'pixi.js';
import type { DashboardState } from '../src/stream/state.ts';
import { ringColour, trackColour } from '../src/plan/palette.ts';
import { type View, toScreen } from '../src/plan/view.ts';

export class NaivePlan {
  private readonly g = new Graphics();
  constructor(private readonly app: Application) {
    app.stage.addChild(this.g);
  }

  render(view: View, s: DashboardState): void {
    const g = this.g.clear();
    const o = toScreen(view, 0, 0);
    for (let r = 1; r <= 8; r++) g.circle(o.px, o.py, r * view.scale);
    for (let d = 0; d < 360; d += 30) {
      const a = (d * Math.PI) / 180;
      g.moveTo(o.px, o.py).lineTo(o.px + 8 * view.scale * Math.sin(a), o.py - 8 * view.scale * Math.cos(a));
    }
    g.stroke({ width: 1, color: ringColour, alpha: 0.5 });
    for (const t of s.tracks.values()) {
      const h = t.history;
      for (let q = h.firstSeq; q < h.pushed; q++) {
        const i = q % h.capacity;
        const p = toScreen(view, h.x[i], h.y[i]);
        if (q === h.firstSeq) g.moveTo(p.px, p.py); else g.lineTo(p.px, p.py);
      }
      g.stroke({ width: 1, color: trackColour(t.id), pixelLine: true });
      const p = toScreen(view, t.latest.x, t.latest.y);
      g.circle(p.px, p.py, 6).fill({ color: trackColour(t.id) });
      g.moveTo(p.px, p.py).lineTo(p.px + t.latest.vx * view.scale, p.py - t.latest.vy * view.scale).stroke({ width: 2, color: trackColour(t.id) });
    }
    for (const d of s.detections) {
      const p = toScreen(view, d.x, d.y);
      g.circle(p.px, p.py, 2.5).fill({ color: 0xe8edf2, alpha: Math.max(0.15, 1 - (s.timeS - d.timeS) / 3) });
    }
    this.app.render();
  }
}
