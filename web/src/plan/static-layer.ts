/**
 * Range rings, azimuth spokes, coverage and the optional metric grid. Drawn in screen space and
 * rebuilt only when the view (pan, zoom, size) or a toggle changes, never per stream frame.
 */
import { Container, Graphics, Text } from 'pixi.js';
import { type Coverage, arcPoints, isFullTurn } from './coverage.ts';
import { coverageColour, gridColour, ringColour, ringLabelColour } from './palette.ts';
import { type View, niceStep, toScreen, visibleBounds } from './view.ts';
import { type LabelBox, overlaps } from './label-placement.ts';

const SPOKE_STEP_DEG = 30;

export class StaticLayer {
  readonly container = new Container();
  private readonly lines = new Graphics();
  private readonly labels: Text[] = [];
  private key = '';

  constructor() {
    this.container.addChild(this.lines);
  }

  /**
   * Redraws when the view, coverage, grid toggle or overlays changed; returns whether it did.
   * `covered`: screen boxes of the controls laid over the canvas (toolbar, legend); no label is
   * placed under one.
   */
  update(view: View, coverage: Coverage, showGrid: boolean, covered: readonly LabelBox[] = []): boolean {
    const key = `${view.centreX},${view.centreY},${view.scale},${view.width},${view.height},${showGrid},${JSON.stringify(coverage)},${JSON.stringify(covered)}`;
    if (key === this.key) return false;
    this.key = key;
    const g = this.lines.clear();
    let label = 0;
    this.drawCoverage(g, view, coverage);
    const step = niceStep(view.scale);
    if (showGrid) this.drawGrid(g, view, step);
    const o = toScreen(view, 0, 0);
    const far = Math.max(coverage.maxRangeM, step);
    // Rings every `step` out to the coverage edge, labelled along a line from the radar towards
    // the middle of the screen (so labels stay in view when zoomed in), offset from any spoke.
    const radii: number[] = [];
    for (let r = step; r <= far + 1e-9; r += step) radii.push(r);
    const labelAz = ringLabelAzimuthClear(view, radii, covered);
    for (const r of radii) {
      g.circle(o.px, o.py, r * view.scale).stroke({ width: 1, color: ringColour, alpha: 0.55 });
      const p = toScreen(view, r * Math.sin(labelAz), r * Math.cos(labelAz));
      this.placeLabel(label++, `${trimNumber(r)} m`, p.px + 3, p.py - 3, 0, 1);
    }
    const spokeR = far * view.scale;
    for (let deg = 0; deg < 360; deg += SPOKE_STEP_DEG) {
      const az = (deg * Math.PI) / 180;
      const dx = Math.sin(az), dy = -Math.cos(az);
      g.moveTo(o.px + dx * 8, o.py + dy * 8).lineTo(o.px + dx * spokeR, o.py + dy * spokeR);
      const d = spokeLabelDistance(o.px, o.py, dx, dy, spokeR + 14, `${deg}°`, covered);
      this.placeLabel(label++, `${deg}°`, o.px + dx * d, o.py + dy * d, 0.5, 0.5);
    }
    g.stroke({ width: 1, color: ringColour, alpha: 0.35 });
    // The radar itself: a small open square with a tick towards 0°, distinct from track symbols.
    g.rect(o.px - 5, o.py - 5, 10, 10).stroke({ width: 2, color: ringLabelColour, alpha: 0.9 });
    g.moveTo(o.px, o.py - 5).lineTo(o.px, o.py - 12).stroke({ width: 2, color: ringLabelColour, alpha: 0.9 });
    for (let i = label; i < this.labels.length; i++) this.labels[i].visible = false;
    return true;
  }

  private drawCoverage(g: Graphics, view: View, c: Coverage): void {
    const full = isFullTurn(c);
    const outer = arcPoints(c.maxRangeM, c.sectorStartRad, full ? c.sectorStartRad + 2 * Math.PI : c.sectorEndRad);
    const inner = arcPoints(c.minRangeM, c.sectorStartRad, full ? c.sectorStartRad + 2 * Math.PI : c.sectorEndRad).reverse();
    const poly = [...outer, ...inner].flatMap((p) => { const s = toScreen(view, p.x, p.y); return [s.px, s.py]; });
    g.poly(poly, true).fill({ color: coverageColour, alpha: 0.9 });
    if (full) {
      const o = toScreen(view, 0, 0);
      g.circle(o.px, o.py, c.minRangeM * view.scale).fill({ color: 0x0c1116, alpha: 1 });
    }
  }

  private drawGrid(g: Graphics, view: View, step: number): void {
    const b = visibleBounds(view);
    for (let x = Math.ceil(b.minX / step) * step; x <= b.maxX; x += step) {
      const s = toScreen(view, x, 0);
      g.moveTo(s.px, 0).lineTo(s.px, view.height);
    }
    for (let y = Math.ceil(b.minY / step) * step; y <= b.maxY; y += step) {
      const s = toScreen(view, 0, y);
      g.moveTo(0, s.py).lineTo(view.width, s.py);
    }
    g.stroke({ width: 1, color: gridColour, alpha: 0.8 });
  }

  private placeLabel(i: number, text: string, x: number, y: number, ax: number, ay: number): void {
    let t = this.labels[i];
    if (!t) {
      t = new Text({ text, style: { fontFamily: 'system-ui, sans-serif', fontSize: 12, fill: ringLabelColour } });
      this.labels[i] = t;
      this.container.addChild(t);
    }
    if (t.text !== text) t.text = text;
    t.anchor.set(ax, ay);
    t.position.set(Math.round(x), Math.round(y));
    t.visible = true;
  }
}

/** Approximate screen box of a 12 px label (system-ui digits are about 7 px wide). */
export function labelBox(text: string, x: number, y: number, ax: number, ay: number): LabelBox {
  const w = text.length * 7 + 2, h = 15;
  return { x: x - ax * w, y: y - ay * h, w, h };
}

/**
 * Distance from the radar along a spoke for its label: just beyond the coverage edge, or pulled in
 * along the spoke (up to ~100 px) until it is clear of every overlay; beyond that it stays out.
 */
export function spokeLabelDistance(ox: number, oy: number, dx: number, dy: number, outside: number, text: string, covered: readonly LabelBox[]): number {
  for (let d = outside, k = 0; k <= 8 && d > 20; d -= 14, k++) {
    const b = labelBox(text, ox + dx * d, oy + dy * d, 0.5, 0.5);
    if (!covered.some((c) => overlaps(b, c))) return d;
  }
  return outside;
}

/** The ring-label azimuth (ringLabelAzimuth), or the first of its quarter turns whose labels no overlay covers. */
export function ringLabelAzimuthClear(view: View, radii: readonly number[], covered: readonly LabelBox[]): number {
  const base = ringLabelAzimuth(view);
  if (covered.length === 0) return base;
  for (const turn of [0, -Math.PI / 2, Math.PI / 2, Math.PI]) {
    const az = base + turn;
    const clear = radii.every((r) => {
      const p = toScreen(view, r * Math.sin(az), r * Math.cos(az));
      return !covered.some((c) => overlaps(labelBox(`${trimNumber(r)} m`, p.px + 3, p.py - 3, 0, 1), c));
    });
    if (clear) return az;
  }
  return base;
}

/** Azimuth along which ring labels go: towards the view centre, or 45° when the radar is centred. */
export function ringLabelAzimuth(view: View): number {
  if (Math.hypot(view.centreX, view.centreY) * view.scale < 40) return Math.PI / 4;
  const az = Math.atan2(view.centreX, view.centreY);
  // Keep clear of the spokes (every 30°) so labels do not sit on a line.
  const spoke = (SPOKE_STEP_DEG * Math.PI) / 180;
  const off = ((az % spoke) + spoke) % spoke;
  return off < spoke * 0.25 || off > spoke * 0.75 ? az + spoke * 0.3 : az;
}

/** "0.5", "1", "2.5": ring labels without trailing zeros. */
export function trimNumber(v: number): string {
  return Number(v.toPrecision(6)).toString();
}
