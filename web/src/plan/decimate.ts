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
 * Heading wraps at 360°: a line from 359° to 1° would sweep the whole chart. Insert a gap (NaN)
 * wherever consecutive values jump by more than half a turn.
 */
export function breakWraps(series: Series, period = 360): Series {
  const out: Series = { t: [], v: [] };
  for (let i = 0; i < series.t.length; i++) {
    if (i > 0 && Math.abs(series.v[i] - series.v[i - 1]) > period / 2) {
      out.t.push((series.t[i] + series.t[i - 1]) / 2);
      out.v.push(NaN);
    }
    out.t.push(series.t[i]);
    out.v.push(series.v[i]);
  }
  return out;
}
