/**
 * Which slices of a track's history each trail chunk draws. Pure, so the incremental drawing can
 * be tested without a GPU.
 *
 * Chunk k owns sequence numbers [k·size, (k+1)·size] — the last point is shared with the next
 * chunk so the line has no gaps. Chunks whose points have all left the visible window are
 * dropped; the oldest visible chunk is clipped to the window; only a chunk whose range changed
 * needs stroking again, which in steady streaming is the newest one (and, now and then, the oldest).
 */
export interface ChunkRange {
  index: number;
  /** First and last sequence numbers this chunk should draw (inclusive). */
  from: number;
  to: number;
}

/**
 * @param windowStart first sequence number to show (already clamped to what the ring holds)
 * @param pushed total points pushed (newest has sequence pushed − 1)
 */
export function chunkRanges(windowStart: number, pushed: number, size: number): ChunkRange[] {
  const out: ChunkRange[] = [];
  const last = pushed - 1;
  if (last - windowStart < 1) return out;
  for (let k = Math.floor(windowStart / size); k * size < last; k++) {
    out.push({ index: k, from: Math.max(k * size, windowStart), to: Math.min((k + 1) * size, last) });
  }
  return out;
}

/** What a chunk last drew. */
export interface DrawnRange { from: number; to: number }

/**
 * Whether a chunk must be stroked again. The clipped oldest chunk is only redrawn once its start
 * lags the window by `slack` points: a trail a few points too long is invisible, a full re-stroke
 * of every track every frame is not.
 */
export function needsRestroke(drawn: DrawnRange | undefined, want: ChunkRange, slack: number): boolean {
  if (!drawn) return true;
  if (drawn.to !== want.to) return true;
  if (want.from < drawn.from) return true;
  return want.from - drawn.from > slack;
}

/** Seconds of trail to show → first sequence number, given the ring's time column. */
export function windowStartFor(
  firstSeq: number,
  seqAtOrAfter: (t: number) => number,
  nowS: number,
  trailSeconds: number,
): number {
  if (!Number.isFinite(trailSeconds)) return firstSeq;
  return Math.max(firstSeq, seqAtOrAfter(nowS - trailSeconds) - 1);
}
