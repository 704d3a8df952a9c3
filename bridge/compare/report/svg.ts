/**
 * Minimal SVG charts for the self-contained report: a time plot and an equal-aspect plan view.
 * Strings only (no DOM), so the report is written by Node and opens anywhere without network.
 */

/** One polyline of a chart. */
export interface Series {
  name: string;
  /** CSS colour. */
  color: string;
  /** [x, y] pairs; NaN breaks the line. */
  points: [number, number][];
  /** Dashed stroke. */
  dash?: boolean;
  /** Stroke width, px. */
  width?: number;
}

/** A vertical marker line of a time plot. */
export interface Marker {
  x: number;
  /** Short text printed beside the line (when there is room). */
  label: string;
  /** Tooltip of the line (default: the label): room for the whole sentence. */
  title?: string;
}

/** Chart frame. */
export interface ChartOptions {
  /** Unique within the page (names the clip path). */
  id: string;
  width: number;
  height: number;
  xLabel: string;
  yLabel: string;
  /** Draw y = 0 as a reference line. */
  zeroLine?: boolean;
  /** Vertical markers (e.g. track id changes) at these x. */
  markers?: Marker[];
  /** Symmetric y range around 0 (signed errors). */
  symmetric?: boolean;
  /** A shaded x interval (e.g. a confidence interval), with its tooltip. */
  band?: { from: number; to: number; label: string };
}

/** Escape text for HTML/SVG content and attributes. */
export function esc(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}

/**
 * Round tick steps 1, 2, 5 × 10^k giving about `n` ticks over [lo, hi], and never fewer than three
 * when the range allows: a symmetric ±194° range with a 200° step would label only 0.
 */
export function niceTicks(lo: number, hi: number, n = 6): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / n;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const steps = [0.1, 0.2, 0.5, 1, 2, 5, 10].map((m) => m * mag);
  let k = steps.findIndex((s) => s >= raw);
  if (k < 0) k = steps.length - 1;
  let out = ticksAt(lo, hi, steps[k]);
  while (out.length < 3 && k > 0) out = ticksAt(lo, hi, steps[--k]);
  return out;
}

function ticksAt(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  // Integer multiples, rounded: accumulating the step would print 0.6000000000000001.
  for (let i = Math.ceil(lo / step - 1e-9); i <= Math.floor(hi / step + 1e-9); i++) out.push(i === 0 ? 0 : Number((i * step).toPrecision(12)));
  return out;
}

/**
 * A number already formatted (toFixed, toPrecision…) as the report shows it: with the true minus
 * sign U+2212 (a hyphen reads as a dash in a column of figures), and without a sign when it rounds
 * to zero: "−0.00 s" would claim a measured negative that the digits do not show.
 */
export function reportNumber(text: string): string {
  if (/^-[0.]+$/.test(text)) return text.slice(1);
  return text.replace(/-/g, '−');
}

function fmt(v: number): string {
  const a = Math.abs(v);
  return reportNumber(a !== 0 && (a < 0.01 || a >= 1e4) ? v.toExponential(1) : String(Number(v.toPrecision(4))));
}

/** Keep at most ~max points per series (every k-th, plus each bucket's extreme), to bound file size. */
export function decimate(points: [number, number][], max = 1500): [number, number][] {
  if (points.length <= max) return points;
  const k = Math.ceil(points.length / (max / 2));
  const out: [number, number][] = [];
  for (let i = 0; i < points.length; i += k) {
    const bucket = points.slice(i, i + k);
    let hi = bucket[0];
    let lo = bucket[0];
    for (const p of bucket) {
      if (p[1] > hi[1]) hi = p;
      if (p[1] < lo[1]) lo = p;
    }
    out.push(...(hi[0] < lo[0] ? [hi, lo] : [lo, hi]));
  }
  return out;
}

function pathData(points: [number, number][], sx: (v: number) => number, sy: (v: number) => number): string {
  let d = '';
  let pen = false;
  for (const [x, y] of points) {
    if (!Number.isFinite(x) || !Number.isFinite(y)) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${sx(x).toFixed(1)},${sy(y).toFixed(1)}`;
    pen = true;
  }
  return d;
}

const M = { left: 58, right: 14, top: 12, bottom: 40 };

/** Width of a marker label, px: the report's 10 px sans-serif averages under 6 px a character. */
const LABEL_CHAR_PX = 6;

/** What a labelled marker adds for the unlabelled ones after it: a bare "+1" read as part of the label. */
function moreSuffix(hidden: number): string {
  return ` (+${hidden} more)`;
}

/**
 * Which marker lines get a label: left to right, a label only where it clears the one before, so
 * that a burst of track switches does not print over itself. A labelled marker says how many
 * unlabelled ones follow before the next label ("(+3 more)"); every line keeps its own tooltip.
 */
export function placeMarkerLabels(markers: Marker[], sx: (v: number) => number): { x: number; label: string; title: string }[] {
  const sorted = [...markers].sort((a, b) => a.x - b.x);
  const out = sorted.map((m) => ({ x: m.x, label: '', title: m.title ?? m.label }));
  let last = -1;
  let freeFromPx = -Infinity;
  let hidden = 0;
  const closeGroup = () => {
    if (last >= 0 && hidden > 0) out[last].label += moreSuffix(hidden);
    hidden = 0;
  };
  sorted.forEach((m, i) => {
    const px = sx(m.x);
    if (px >= freeFromPx) {
      closeGroup();
      out[i].label = m.label;
      last = i;
      // Room for the label and a possible " (+N more)" suffix.
      freeFromPx = px + 3 + (m.label.length + moreSuffix(99).length) * LABEL_CHAR_PX;
    } else hidden++;
  });
  closeGroup();
  return out;
}

function frame(o: ChartOptions, xr: [number, number], yr: [number, number], body: (sx: (v: number) => number, sy: (v: number) => number) => string): string {
  const w = o.width - M.left - M.right;
  const h = o.height - M.top - M.bottom;
  const sx = (v: number) => M.left + ((v - xr[0]) / (xr[1] - xr[0] || 1)) * w;
  const sy = (v: number) => M.top + h - ((v - yr[0]) / (yr[1] - yr[0] || 1)) * h;
  const parts: string[] = [];
  for (const t of niceTicks(xr[0], xr[1], Math.max(3, Math.round(w / 90)))) {
    parts.push(`<line class="grid" x1="${sx(t)}" x2="${sx(t)}" y1="${M.top}" y2="${M.top + h}"/><text class="tick" x="${sx(t)}" y="${M.top + h + 15}" text-anchor="middle">${fmt(t)}</text>`);
  }
  for (const t of niceTicks(yr[0], yr[1], Math.max(3, Math.round(h / 45)))) {
    parts.push(`<line class="grid" x1="${M.left}" x2="${M.left + w}" y1="${sy(t)}" y2="${sy(t)}"/><text class="tick" x="${M.left - 6}" y="${sy(t) + 4}" text-anchor="end">${fmt(t)}</text>`);
  }
  if (o.band) {
    const x0 = sx(Math.max(xr[0], o.band.from));
    const x1 = sx(Math.min(xr[1], o.band.to));
    parts.push(`<rect class="band" x="${x0.toFixed(1)}" y="${M.top}" width="${Math.max(1, x1 - x0).toFixed(1)}" height="${h}"><title>${esc(o.band.label)}</title></rect>`);
  }
  if (o.zeroLine && yr[0] < 0 && yr[1] > 0) parts.push(`<line class="zero" x1="${M.left}" x2="${M.left + w}" y1="${sy(0)}" y2="${sy(0)}"/>`);
  for (const m of placeMarkerLabels((o.markers ?? []).filter((m) => m.x >= xr[0] && m.x <= xr[1]), sx)) {
    parts.push(`<line class="marker" x1="${sx(m.x)}" x2="${sx(m.x)}" y1="${M.top}" y2="${M.top + h}"><title>${esc(m.title)}</title></line>`);
    if (m.label) parts.push(`<text class="marker-label" x="${sx(m.x) + 3}" y="${M.top + 10}">${esc(m.label)}</text>`);
  }
  parts.push(`<rect class="plot-border" x="${M.left}" y="${M.top}" width="${w}" height="${h}"/>`);
  parts.push(`<clipPath id="clip-${o.id}"><rect x="${M.left}" y="${M.top}" width="${w}" height="${h}"/></clipPath>`);
  parts.push(`<g clip-path="url(#clip-${o.id})">${body(sx, sy)}</g>`);
  parts.push(`<text class="axis-label" x="${M.left + w / 2}" y="${o.height - 6}" text-anchor="middle">${esc(o.xLabel)}</text>`);
  parts.push(`<text class="axis-label" transform="translate(14 ${M.top + h / 2}) rotate(-90)" text-anchor="middle">${esc(o.yLabel)}</text>`);
  return `<svg xmlns="http://www.w3.org/2000/svg" class="chart" viewBox="0 0 ${o.width} ${o.height}" width="${o.width}" height="${o.height}" role="img">${parts.join('')}</svg>`;
}

function extent(series: Series[], axis: 0 | 1): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const s of series) for (const p of s.points) if (Number.isFinite(p[axis])) { lo = Math.min(lo, p[axis]); hi = Math.max(hi, p[axis]); }
  if (!Number.isFinite(lo)) return [0, 1];
  if (hi === lo) return [lo - 0.5, hi + 0.5];
  return [lo, hi];
}

/** Every k-th point, for plan views (min/max buckets would zigzag a path drawn in x and y). */
export function stride(points: [number, number][], max = 3000): [number, number][] {
  if (points.length <= max) return points;
  const k = Math.ceil(points.length / max);
  return points.filter((p, i) => i % k === 0 || !Number.isFinite(p[0]) || i === points.length - 1);
}

function strokes(series: Series[], sx: (v: number) => number, sy: (v: number) => number, thin = decimate): string {
  return series
    .map((s) => `<path d="${pathData(thin(s.points), sx, sy)}" fill="none" stroke="${s.color}" stroke-width="${s.width ?? 1.5}"${s.dash ? ' stroke-dasharray="5 4"' : ''} stroke-linejoin="round"><title>${esc(s.name)}</title></path>`)
    .join('');
}

/** A plot of series against time (or any x). */
export function timePlot(series: Series[], o: ChartOptions): string {
  const xr = extent(series, 0);
  let yr = extent(series, 1);
  if (o.symmetric) {
    const m = Math.max(Math.abs(yr[0]), Math.abs(yr[1])) * 1.08 || 1;
    yr = [-m, m];
  } else {
    yr = [Math.min(0, yr[0]), yr[1] + (yr[1] - Math.min(0, yr[0])) * 0.08];
  }
  return frame(o, xr, yr, (sx, sy) => strokes(series, sx, sy));
}

/** Plan view in the radar frame with equal scales on both axes; the radar (origin) marked when in view. */
export function planPlot(series: Series[], o: ChartOptions, dots: { x: number; y: number; label: string; color: string }[] = []): string {
  let xr = extent(series, 0);
  let yr = extent(series, 1);
  const w = o.width - M.left - M.right;
  const h = o.height - M.top - M.bottom;
  // Equal metres per pixel: widen the range that is short for its side.
  const scale = Math.max((xr[1] - xr[0]) / w, (yr[1] - yr[0]) / h) * 1.1;
  const cx = (xr[0] + xr[1]) / 2;
  const cy = (yr[0] + yr[1]) / 2;
  xr = [cx - (scale * w) / 2, cx + (scale * w) / 2];
  yr = [cy - (scale * h) / 2, cy + (scale * h) / 2];
  return frame(o, xr, yr, (sx, sy) => {
    let extra = '';
    if (0 >= xr[0] && 0 <= xr[1] && 0 >= yr[0] && 0 <= yr[1]) {
      extra += `<path class="radar" d="M${sx(0) - 6},${sy(0) + 5}L${sx(0)},${sy(0) - 7}L${sx(0) + 6},${sy(0) + 5}Z"><title>radar</title></path>`;
    }
    for (const d of dots) extra += `<circle cx="${sx(d.x)}" cy="${sy(d.y)}" r="4" fill="${d.color}" stroke="#fff" stroke-width="1"><title>${esc(d.label)}</title></circle>`;
    return strokes(series, sx, sy, (p) => stride(p)) + extra;
  });
}
