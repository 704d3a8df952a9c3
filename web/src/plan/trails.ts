/**
 * Track trails in world coordinates, one Graphics per chunk of history (see trail-chunks.ts).
 * Strokes are 1-device-pixel lines (`pixelLine`), so zooming rescales the cached geometry
 * instead of tessellating 250,000 points again.
 */
import { Container, Graphics } from 'pixi.js';
import type { TrackEntry } from '../stream/state.ts';
import { type DrawnRange, chunkRanges, needsRestroke, windowStartFor } from './trail-chunks.ts';
import { trackColour } from './palette.ts';

export const CHUNK_POINTS = 256;
const HEAD_SLACK = CHUNK_POINTS / 8;

interface Chunk { g: Graphics; drawn: DrawnRange }
interface Trail { container: Container; chunks: Map<number, Chunk>; epoch: number }

export class TrailLayer {
  readonly container = new Container();
  private trails = new Map<number, Trail>();
  /** Points stroked in the last update: the bench and tests read it. */
  strokedPoints = 0;

  update(tracks: Map<number, TrackEntry>, nowS: number, trailSeconds: number, epoch: number): void {
    this.strokedPoints = 0;
    for (const [id, trail] of this.trails) {
      if (!tracks.has(id) || trail.epoch !== epoch) this.drop(id, trail);
    }
    for (const entry of tracks.values()) {
      let trail = this.trails.get(entry.id);
      if (!trail) {
        trail = { container: new Container(), chunks: new Map(), epoch };
        this.trails.set(entry.id, trail);
        this.container.addChild(trail.container);
      }
      this.updateTrail(trail, entry, nowS, trailSeconds);
    }
  }

  private updateTrail(trail: Trail, entry: TrackEntry, nowS: number, trailSeconds: number): void {
    const h = entry.history;
    const start = windowStartFor(h.firstSeq, (t) => h.seqAtOrAfter(t), nowS, trailSeconds);
    const ranges = chunkRanges(start, h.pushed, CHUNK_POINTS);
    const keep = new Set(ranges.map((r) => r.index));
    for (const [k, c] of trail.chunks) {
      if (!keep.has(k)) { c.g.destroy(); trail.chunks.delete(k); }
    }
    const colour = trackColour(entry.id);
    const n = ranges.length;
    ranges.forEach((r, i) => {
      let c = trail.chunks.get(r.index);
      if (!c || needsRestroke(c.drawn, r, HEAD_SLACK)) {
        if (!c) {
          c = { g: new Graphics(), drawn: { from: r.from, to: r.to } };
          trail.chunks.set(r.index, c);
          trail.container.addChild(c.g);
        }
        strokeRange(c.g, entry, r.from, r.to, colour);
        c.drawn = { from: r.from, to: r.to };
        this.strokedPoints += r.to - r.from + 1;
      }
      // Older chunks fade: age is shown without restroking anything.
      c.g.alpha = 0.3 + 0.7 * ((i + 1) / n);
    });
  }

  private drop(id: number, trail: Trail): void {
    trail.container.destroy({ children: true });
    this.trails.delete(id);
  }

  clear(): void {
    for (const [id, t] of this.trails) this.drop(id, t);
  }
}

function strokeRange(g: Graphics, entry: TrackEntry, from: number, to: number, colour: number): void {
  const h = entry.history;
  g.clear();
  let i = h.slot(from);
  g.moveTo(h.x[i], h.y[i]);
  for (let s = from + 1; s <= to; s++) {
    i = s % h.capacity;
    g.lineTo(h.x[i], h.y[i]);
  }
  g.stroke({ width: 1, color: colour, alpha: 1, pixelLine: true });
}
