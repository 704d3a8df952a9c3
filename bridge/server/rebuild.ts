/**
 * After a seek in a replay that carries no tracks (a detections CSV), the tracker has to be run
 * again from the start of the run up to the seek time, quietly, so the picture at the new position
 * is what it would have been had the replay played through. Sessions that carry their tracks need
 * none of this for the picture: their source re-sends the state at the new position itself. The
 * running comparison is rebuilt from the start either way (rebuildComparison): figures such as
 * the running RMSE sum over the whole run, and the re-sent state holds only its last window.
 */
import type { LiveComparisonLike, ReplaySourceLike } from './deps.ts';
import type { TrackEngine } from '../types.ts';
import type { SourceRecord } from '../ingest/source.ts';
import type { LiveState } from './state.ts';

/** Records fed between two yields to the event loop, so a long fast-forward keeps the server responsive. */
const CHUNK = 20_000;

/**
 * Feeds the tracker every detection before `timeS` and leaves `state` holding the tracks,
 * history, recent detections and fixed echoes at that time, and `comparison` (reset) the
 * figures. Returns false when the source offers no way to read its history, or when
 * `abandoned()` turned true (a newer seek overtook this one).
 */
export async function rebuildAfterSeek(
  source: ReplaySourceLike,
  tracker: TrackEngine,
  state: LiveState,
  timeS: number,
  abandoned: () => boolean,
  comparison: LiveComparisonLike | null = null,
): Promise<boolean> {
  const done = await replayUntil(source, timeS, abandoned, (r) => {
    if (r.kind === 'detection') {
      if (r.detection.timeS > timeS) return false;
      if (r.detection.timeS >= timeS - state.options.recentDetectionsS) state.addDetection(r.detection);
      const out = tracker.push(r.detection);
      for (const u of out.updates) (state.addUpdate(u), comparison?.update(u));
      for (const d of out.deletions) (state.addDeletion(d), comparison?.deletion(d));
    } else if (r.kind === 'positioner') {
      state.addPositioner(r.sample);
      comparison?.positioner(r.sample);
    } else if (r.kind === 'antenna') {
      state.antennaAzimuthRad = r.sample.azimuthRad;
    } else if (r.kind === 'commanded') {
      state.setCommanded(r.path, r.target);
      comparison?.commanded(r.path, r.target);
    }
    return true;
  });
  if (!done) return false;
  state.fixedEchoes = tracker.fixedEchoes();
  state.timeS = Math.max(state.timeS, timeS);
  return true;
}

/**
 * Feeds `comparison` (a fresh one) every commanded path, positioner sample, track update and
 * deletion a recorded session holds before `timeS`, so its figures are those of the run played
 * through to there; and builds the state's paths from positioner samples again the same way (the
 * ones held reach past a seek back, and the re-sent state holds no positioner history). Returns
 * false when the source offers no history or when `abandoned()` turned true.
 */
export async function rebuildComparison(source: ReplaySourceLike, comparison: LiveComparisonLike, state: LiveState, timeS: number, abandoned: () => boolean): Promise<boolean> {
  if (typeof source.recordsUntil !== 'function') return false;
  state.clearPositionerPaths();
  return replayUntil(source, timeS, abandoned, (r) => {
    if (r.kind === 'commanded') comparison.commanded(r.path, r.target);
    else if (r.kind === 'positioner') (comparison.positioner(r.sample), state.addPositioner(r.sample));
    else if (r.kind === 'track') comparison.update(r.update);
    else if (r.kind === 'deletion') comparison.deletion(r.deletion);
    return true;
  });
}

/**
 * Hands `visit` every record of the run up to `timeS`, yielding to the event loop every CHUNK
 * records. True once all were visited or `visit` said stop (false); false when the source has
 * no history or `abandoned()` turned true at a yield.
 */
async function replayUntil(source: ReplaySourceLike, timeS: number, abandoned: () => boolean, visit: (r: SourceRecord) => boolean): Promise<boolean> {
  if (typeof source.recordsUntil !== 'function') return false;
  let n = 0;
  for await (const r of source.recordsUntil(timeS)) {
    if (!visit(r)) break;
    if (++n % CHUNK === 0) {
      await new Promise((res) => setImmediate(res));
      if (abandoned()) return false;
    }
  }
  return true;
}
