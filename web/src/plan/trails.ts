/**
 * Track trails in world coordinates, one Graphics per chunk of history (see trail-chunks.ts).
 *
 * Two tiers, because with software rendering drawing 250,000 cached line segments every frame
 * still costs the rasteriser most of the frame:
 * - the newest chunk of every track is "live": it sits on the stage and is re-stroked as points
 *   arrive;
 * - older chunks are "settled": they are kept off the stage and rendered into a texture (by the
 *   scene) only when one of them changes or the view moves. Between those moments a frame costs
 *   one textured quad plus 50 short tails.
 * Strokes are 1-device-pixel lines (`pixelLine`), so zooming reuses the geometry as it is.
 */
import { Container, Graphics } from 'pixi.js';
import type { TrackEntry } from '../stream/state.ts';
import { type DrawnRange, chunkRanges, needsRestroke, windowStartFor } from './trail-chunks.ts';
import { trackColour } from './palette.ts';

export const CHUNK_POINTS = 256;
const HEAD_SLACK = CHUNK_POINTS / 8;

interface Chunk { g: Graphics; drawn: DrawnRange; live: boolean; alpha: number }
interface Trail { chunks: Map<number, Chunk>; epoch: number }

export class TrailLayer {
  /** On the stage (inside the world transform): the newest chunk of each track. */
  readonly live = new Container();
  /** Off the stage: everything older, rendered into a cached texture when `settledDirty`. */
  readonly settled = new Container();
  /** Something in `settled` changed since the scene last rendered it. */
  settledDirty = true;
  /** Points stroked in the last update: the bench and tests read it. */
  strokedPoints = 0;
  private trails = new Map<number, Trail>();
  /**
   * The canvas renderer cannot draw `pixelLine` strokes (it fills them), so there trails are
   * stroked with a world-unit width for the current zoom and re-stroked when the zoom changes.
   */
  private worldWidth: number | null = null;

  /** null: 1-pixel lines (WebGL); a number: stroke width in metres (canvas fallback). */
  setWorldWidth(width: number | null): void {
    if (width === this.worldWidth) return;
    this.worldWidth = width;
    for (const t of this.trails.values()) for (const c of t.chunks.values()) c.drawn = { from: -1, to: -1 };
  }

  update(tracks: Map<number, TrackEntry>, nowS: number, trailSeconds: number, epoch: number): void {
    this.strokedPoints = 0;
    for (const [id, trail] of this.trails) {
      if (!tracks.has(id) || trail.epoch !== epoch) this.drop(id, trail);
    }
    for (const entry of tracks.values()) {
      let trail = this.trails.get(entry.id);
      if (!trail) {
        trail = { chunks: new Map(), epoch };
        this.trails.set(entry.id, trail);
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
      if (keep.has(k)) continue;
      if (!c.live) this.settledDirty = true;
      c.g.destroy();
      trail.chunks.delete(k);
    }
    const colour = trackColour(entry.id);
    const n = ranges.length;
    ranges.forEach((r, i) => {
      const newest = i === n - 1;
      let c = trail.chunks.get(r.index);
      if (!c) {
        c = { g: new Graphics(), drawn: { from: -1, to: -1 }, live: newest, alpha: -1 };
        trail.chunks.set(r.index, c);
        (newest ? this.live : this.settled).addChild(c.g);
        if (!newest) this.settledDirty = true;
      } else if (c.live && !newest) {
        // The chunk filled up: it moves into the cached tier.
        this.settled.addChild(c.g);
        c.live = false;
        this.settledDirty = true;
      }
      if (c.drawn.from < 0 || needsRestroke(c.drawn, r, HEAD_SLACK)) {
        strokeRange(c.g, entry, r.from, r.to, colour, this.worldWidth);
        c.drawn = { from: r.from, to: r.to };
        this.strokedPoints += r.to - r.from + 1;
        if (!c.live) this.settledDirty = true;
      }
      // Older chunks fade: age is shown without re-stroking anything.
      const alpha = Math.round((0.3 + 0.7 * ((i + 1) / n)) * 20) / 20;
      if (alpha !== c.alpha) {
        c.alpha = alpha;
        c.g.alpha = alpha;
        if (!c.live) this.settledDirty = true;
      }
    });
  }

  private drop(id: number, trail: Trail): void {
    for (const c of trail.chunks.values()) {
      if (!c.live) this.settledDirty = true;
      c.g.destroy();
    }
    this.trails.delete(id);
  }

  clear(): void {
    for (const [id, t] of this.trails) this.drop(id, t);
  }
}

function strokeRange(g: Graphics, entry: TrackEntry, from: number, to: number, colour: number, worldWidth: number | null): void {
  const h = entry.history;
  g.clear();
  let i = h.slot(from);
  g.moveTo(h.x[i], h.y[i]);
  for (let s = from + 1; s <= to; s++) {
    i = s % h.capacity;
    g.lineTo(h.x[i], h.y[i]);
  }
  if (worldWidth === null) g.stroke({ width: 1, color: colour, alpha: 1, pixelLine: true });
  else g.stroke({ width: worldWidth, color: colour, alpha: 1 });
}
