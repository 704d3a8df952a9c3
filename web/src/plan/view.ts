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

/** The view that shows `b` with `marginPx` to spare on every side; tiny boxes get a minimum size. */
export function fitBounds(v: View, b: Bounds, marginPx = 40, minSpanM = 0.5): View {
  const spanX = Math.max(b.maxX - b.minX, minSpanM);
  const spanY = Math.max(b.maxY - b.minY, minSpanM);
  const usableW = Math.max(1, v.width - 2 * marginPx);
  const usableH = Math.max(1, v.height - 2 * marginPx);
  const scale = clamp(Math.min(usableW / spanX, usableH / spanY), MIN_SCALE, MAX_SCALE);
  return { ...v, scale, centreX: (b.minX + b.maxX) / 2, centreY: (b.minY + b.maxY) / 2 };
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
