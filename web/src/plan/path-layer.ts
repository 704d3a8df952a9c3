/**
 * The commanded path (dashed, so it differs from trails by pattern as well as colour), the
 * positioner's current commanded point, the antenna direction, and the selected track's trail
 * drawn thick. Screen space; the path is rebuilt only when it or the view changes.
 */
import { AlphaFilter, Container, Graphics, Text } from 'pixi.js';
import type { PathPointWire } from '../../../bridge/server/protocol.ts';
import type { DashboardState } from '../stream/state.ts';
import { antennaColour, commandedColour, trackColour } from './palette.ts';
import { type View, toScreen } from './view.ts';
import { PATH_AHEAD_S, errorBandHalfWidthM, pathWindow } from './path-window.ts';
import { pathLabel } from '../stream/path-match.ts';

const DASH_PX = 8;
/** How faint the error band is. */
const BAND_ALPHA = 0.08;
const GAP_PX = 6;

export class PathLayer {
  readonly container = new Container();
  private readonly band = new Graphics();
  private readonly path = new Graphics();
  private readonly live = new Graphics();
  /** One name per path when a run commands several ("path 1", "path 2"), beside its current point. */
  private readonly names: Text[] = [];
  private pathKey = '';
  /** Alpha of the band's own stroke (see useBlendedBand). */
  private bandAlpha = BAND_ALPHA;

  constructor() {
    this.container.addChild(this.band, this.path, this.live);
  }

  /**
   * WebGL blends every triangle of a wide stroke on its own, so where the band's round joins
   * overlap (a path curving tighter than the band is wide) the faint colour piles up into a
   * starburst. There the band is drawn opaque and made faint as a whole, once, by an alpha
   * filter; the 2-D canvas fills a stroke in one piece and needs none.
   */
  useBlendedBand(webgl: boolean): void {
    this.bandAlpha = webgl ? 1 : BAND_ALPHA;
    this.band.filters = webgl ? [new AlphaFilter({ alpha: BAND_ALPHA })] : [];
    this.pathKey = '';
  }

  update(view: View, state: DashboardState, coverageM: number, selectedId: number | null, trailFromS: number): void {
    // Only the part of the commanded path from the trail start to a little ahead of now: a looping
    // path drawn whole would stack its laps on top of each other. The window moves in whole
    // seconds so the path is rebuilt about once a second, not every frame.
    const from = Number.isFinite(trailFromS) ? Math.floor(trailFromS) : -Infinity;
    const to = Number.isFinite(trailFromS) ? Math.ceil(state.timeS) + PATH_AHEAD_S : Infinity;
    // Every commanded path (one per carriage or positioner), each with its own error band.
    const paths = state.commandedPaths;
    const bands = paths.map((p) => errorBandHalfWidthM((state.comparisons.get(p.target) ?? (paths.length === 1 ? state.comparison : null))?.rmseM ?? null));
    const key = `${state.commandedVersion},${from},${to},${view.centreX},${view.centreY},${view.scale},${view.width},${view.height},${bands.join('/')}`;
    if (key !== this.pathKey) {
      this.pathKey = key;
      this.band.clear();
      this.path.clear();
      paths.forEach((p, i) => {
        const window = pathWindow(p.path, from, to);
        drawBand(this.band, view, window, bands[i], this.bandAlpha);
        drawDashed(this.path, view, window);
        this.placeName(i, paths.length > 1 ? pathLabel(p.target, paths.length) : '', view, window);
      });
      for (let i = paths.length > 1 ? paths.length : 0; i < this.names.length; i++) this.names[i].visible = false;
    }
    const g = this.live.clear();
    const sel = selectedId === null ? undefined : state.tracks.get(selectedId);
    if (sel) {
      // Only one track, so re-stroking its visible trail each frame is cheap.
      const h = sel.history;
      const from = Math.max(h.firstSeq, h.seqAtOrAfter(trailFromS));
      for (let s = from; s < h.pushed; s++) {
        const i = s % h.capacity;
        const p = toScreen(view, h.x[i], h.y[i]);
        if (s === from) g.moveTo(p.px, p.py); else g.lineTo(p.px, p.py);
      }
      if (h.pushed - from > 1) g.stroke({ width: 3, color: trackColour(sel.id), alpha: 0.9 });
    }
    // One ✕ per positioner, at its current commanded point.
    for (const pos of state.positioners.values()) {
      const p = toScreen(view, pos.cmdX, pos.cmdY);
      g.moveTo(p.px - 7, p.py - 7).lineTo(p.px + 7, p.py + 7).moveTo(p.px - 7, p.py + 7).lineTo(p.px + 7, p.py - 7)
        .stroke({ width: 2, color: commandedColour });
    }
    if (state.antennaAzimuthRad !== null) {
      const o = toScreen(view, 0, 0);
      const az = state.antennaAzimuthRad;
      const r = coverageM * view.scale;
      const half = 0.05; // drawn beam half-width, radians: a hint of direction, not the real beam
      g.moveTo(o.px, o.py)
        .lineTo(o.px + r * Math.sin(az - half), o.py - r * Math.cos(az - half))
        .lineTo(o.px + r * Math.sin(az + half), o.py - r * Math.cos(az + half))
        .closePath().fill({ color: antennaColour, alpha: 0.12 });
      g.moveTo(o.px, o.py).lineTo(o.px + r * Math.sin(az), o.py - r * Math.cos(az))
        .stroke({ width: 1.5, color: antennaColour, alpha: 0.8 });
    }
  }

  /**
   * Puts path i's name just below the start of its drawn stretch (where crossing paths are apart,
   * unlike their current points), or hides it.
   */
  private placeName(i: number, text: string, view: View, path: readonly PathPointWire[]): void {
    let label = this.names[i];
    if (!text) {
      if (label) label.visible = false;
      return;
    }
    if (!label) {
      label = new Text({ text, style: { fontFamily: 'system-ui, sans-serif', fontSize: 12, fill: commandedColour } });
      label.anchor.set(0.5, 0);
      this.names[i] = label;
      this.container.addChild(label);
    }
    const c = path[0];
    if (!c) {
      label.visible = false;
      return;
    }
    const s = toScreen(view, c.x, c.y);
    if (label.text !== text) label.text = text;
    label.position.set(Math.round(s.px), Math.round(s.py + 10));
    label.visible = true;
  }
}

function drawBand(g: Graphics, view: View, path: readonly PathPointWire[], halfWidthM: number, alpha: number): void {
  if (path.length < 2 || halfWidthM <= 0) return;
  const first = toScreen(view, path[0].x, path[0].y);
  g.moveTo(first.px, first.py);
  for (let i = 1; i < path.length; i++) {
    const p = toScreen(view, path[i].x, path[i].y);
    g.lineTo(p.px, p.py);
  }
  g.stroke({ width: 2 * halfWidthM * view.scale, color: commandedColour, alpha, cap: 'round', join: 'round' });
}

function drawDashed(g: Graphics, view: View, path: readonly PathPointWire[]): void {
  if (path.length < 2) return;
  let on = true;
  let left = DASH_PX;
  let prev = toScreen(view, path[0].x, path[0].y);
  g.moveTo(prev.px, prev.py);
  for (let i = 1; i < path.length; i++) {
    const next = toScreen(view, path[i].x, path[i].y);
    let seg = Math.hypot(next.px - prev.px, next.py - prev.py);
    let x = prev.px, y = prev.py;
    const ux = seg > 0 ? (next.px - prev.px) / seg : 0, uy = seg > 0 ? (next.py - prev.py) / seg : 0;
    while (seg > 0) {
      const d = Math.min(left, seg);
      x += ux * d; y += uy * d;
      if (on) g.lineTo(x, y); else g.moveTo(x, y);
      seg -= d; left -= d;
      if (left <= 0) { on = !on; left = on ? DASH_PX : GAP_PX; }
    }
    prev = next;
  }
  g.stroke({ width: 2, color: commandedColour, alpha: 0.85 });
}
