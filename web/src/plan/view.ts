/**
 * World ↔ screen transform of the plan view. World: metres, radar at the origin, +y up (the
 * antenna's zero). Screen: CSS pixels, y down. Pure functions returning new views.
 */
export interface View {
  /** World point at the centre of the canvas, metres. */
  centreX: number;
  centreY: number;
  /** Pixels per metre. */
  scale: number;
  /** Canvas size, CSS pixels. */
  width: number;
  height: number;
}

export interface Bounds { minX: number; minY: number; maxX: number; maxY: number }

/** Zoom limits: from a whole lab (~50 m across) down to a few centimetres across. */
export const MIN_SCALE = 5;
export const MAX_SCALE = 20000;

export function toScreen(v: View, x: number, y: number): { px: number; py: number } {
  return { px: v.width / 2 + (x - v.centreX) * v.scale, py: v.height / 2 - (y - v.centreY) * v.scale };
}

export function toWorld(v: View, px: number, py: number): { x: number; y: number } {
  return { x: v.centreX + (px - v.width / 2) / v.scale, y: v.centreY - (py - v.height / 2) / v.scale };
}

/** Zoom by `factor` keeping the world point under (px, py) where it is on screen. */
export function zoomAt(v: View, px: number, py: number, factor: number): View {
  const scale = clamp(v.scale * factor, MIN_SCALE, MAX_SCALE);
  const anchor = toWorld(v, px, py);
  return {
    ...v,
    scale,
    centreX: anchor.x - (px - v.width / 2) / scale,
    centreY: anchor.y + (py - v.height / 2) / scale,
  };
}

/** Move the picture by a drag of (dx, dy) pixels. */
export function panBy(v: View, dx: number, dy: number): View {
  return { ...v, centreX: v.centreX - dx / v.scale, centreY: v.centreY + dy / v.scale };
}

/** Screen space kept clear on each side (toolbars over the canvas), CSS pixels. */
export interface Insets { top: number; right: number; bottom: number; left: number }
export const noInsets: Insets = { top: 0, right: 0, bottom: 0, left: 0 };

/**
 * The view that shows `b` with `marginPx` to spare on every side, inside the part of the canvas
 * that `insets` leave free; tiny boxes get a minimum size.
 */
export function fitBounds(v: View, b: Bounds, marginPx = 40, minSpanM = 0.5, insets: Insets = noInsets): View {
  const spanX = Math.max(b.maxX - b.minX, minSpanM);
  const spanY = Math.max(b.maxY - b.minY, minSpanM);
  const usableW = Math.max(1, v.width - 2 * marginPx - insets.left - insets.right);
  const usableH = Math.max(1, v.height - 2 * marginPx - insets.top - insets.bottom);
  const scale = clamp(Math.min(usableW / spanX, usableH / spanY), MIN_SCALE, MAX_SCALE);
  // The box's centre goes to the centre of the free area, not of the canvas.
  const shiftPx = (insets.left - insets.right) / 2, shiftPy = (insets.top - insets.bottom) / 2;
  return { ...v, scale, centreX: (b.minX + b.maxX) / 2 - shiftPx / scale, centreY: (b.minY + b.maxY) / 2 + shiftPy / scale };
}

/** Least extent "Fit tracks" zooms to, metres: one track alone must not fill the screen with 5 cm rings. */
export const FIT_MIN_SPAN_M = 1.2;

/**
 * The box "Fit tracks" frames: the tracks and their visible trails, grown by 15 % on each side
 * and to at least FIT_MIN_SPAN_M across, so a single slow track keeps its trail and some
 * surroundings in view.
 */
export function trackFitBounds(points: Iterable<{ x: number; y: number }>, minSpanM = FIT_MIN_SPAN_M): Bounds | null {
  const b = boundsOf(points);
  if (!b) return null;
  const cx = (b.minX + b.maxX) / 2, cy = (b.minY + b.maxY) / 2;
  const hx = Math.max((b.maxX - b.minX) * 0.65, minSpanM / 2), hy = Math.max((b.maxY - b.minY) * 0.65, minSpanM / 2);
  return { minX: cx - hx, maxX: cx + hx, minY: cy - hy, maxY: cy + hy };
}

/** Bounding box of points, or null when there are none. */
export function boundsOf(points: Iterable<{ x: number; y: number }>): Bounds | null {
  let b: Bounds | null = null;
  for (const p of points) {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) continue;
    if (!b) b = { minX: p.x, minY: p.y, maxX: p.x, maxY: p.y };
    else {
      b.minX = Math.min(b.minX, p.x); b.maxX = Math.max(b.maxX, p.x);
      b.minY = Math.min(b.minY, p.y); b.maxY = Math.max(b.maxY, p.y);
    }
  }
  return b;
}

/** World rectangle visible on screen. */
export function visibleBounds(v: View): Bounds {
  const a = toWorld(v, 0, v.height);
  const b = toWorld(v, v.width, 0);
  return { minX: a.x, minY: a.y, maxX: b.x, maxY: b.y };
}

/**
 * Spacing of range rings / grid lines: the smallest 1-2-5 step (in metres) that keeps lines at
 * least `minPx` apart at this zoom.
 */
export function niceStep(scale: number, minPx = 70): number {
  const raw = minPx / scale;
  const exp = Math.floor(Math.log10(raw));
  for (const m of [1, 2, 5, 10]) {
    const step = m * 10 ** exp;
    if (step >= raw * (1 - 1e-9)) return step;
  }
  return 10 ** (exp + 1);
}

function clamp(v: number, lo: number, hi: number): number {
  return Math.min(hi, Math.max(lo, v));
}
