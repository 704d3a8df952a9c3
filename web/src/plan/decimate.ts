/**
 * Thinning a time series for small charts: at most two points (min and max) per bucket, so spikes
 * survive while 5,000 points become a few hundred that a 300-px chart can actually show.
 */
export interface Series { t: number[]; v: number[] }

export function decimateMinMax(t: ArrayLike<number>, v: ArrayLike<number>, maxPoints: number): Series {
  const n = Math.min(t.length, v.length);
  if (n <= maxPoints || maxPoints < 4) return { t: Array.from(t).slice(0, n), v: Array.from(v).slice(0, n) };
  const buckets = Math.floor(maxPoints / 2);
  const size = n / buckets;
  const out: Series = { t: [], v: [] };
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor(b * size);
    const end = Math.min(n, Math.floor((b + 1) * size));
    let lo = -1, hi = -1;
    for (let i = start; i < end; i++) {
      if (!Number.isFinite(v[i])) continue;
      if (lo < 0 || v[i] < v[lo]) lo = i;
      if (hi < 0 || v[i] > v[hi]) hi = i;
    }
    if (lo < 0) {
      // A bucket of gaps stays a gap (uplot breaks the line at null-like values).
      out.t.push(t[start]);
      out.v.push(NaN);
      continue;
    }
    // Keep time order inside the bucket.
    const [a, b2] = lo <= hi ? [lo, hi] : [hi, lo];
    out.t.push(t[a]); out.v.push(v[a]);
    if (b2 !== a) { out.t.push(t[b2]); out.v.push(v[b2]); }
  }
  return out;
}

/**
 * Heading wraps at 360°: a line from 359° to 1° would sweep the whole chart. Wherever consecutive
 * values jump by more than half a turn, the line is carried to the edge it crosses (the value
 * where the shorter way round meets 360° or 0°, at the interpolated time), broken (NaN), and taken
 * up again from the opposite edge: a target circling on its turntable reads as one continuous
 * sawtooth rather than as dashes stopping short of the edges.
 */
export function breakWraps(series: Series, period = 360): Series {
  const out: Series = { t: [], v: [] };
  for (let i = 0; i < series.t.length; i++) {
    const v1 = series.v[i];
    if (i > 0 && Math.abs(v1 - series.v[i - 1]) > period / 2) {
      const t0 = series.t[i - 1];
      const t1 = series.t[i];
      const v0 = series.v[i - 1];
      // Upwards through 360° (v0 near the top, v1 near 0) or downwards through 0°.
      const up = v1 < v0;
      const end = up ? period : 0;
      const unwrapped = up ? v1 + period : v1 - period;
      const f = (end - v0) / (unwrapped - v0);
      const tc = t0 + (t1 - t0) * f;
      // The two edge points sit a hair either side of the crossing: the chart wants times in order.
      const eps = (t1 - t0) * 1e-6;
      out.t.push(tc - eps, tc, tc + eps);
      out.v.push(end, NaN, period - end);
    }
    out.t.push(series.t[i]);
    out.v.push(v1);
  }
  return out;
}
