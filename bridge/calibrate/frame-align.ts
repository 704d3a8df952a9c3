/**
 * Positioner ↔ radar frame alignment from a run: observed radar-frame positions (detections
 * converted after the offset correction, or a track) paired in time with the commanded path
 * (positioner frame), then the closed-form rigid fit of rigid-fit.ts.
 *
 * Observations may include clutter and fixed echoes. With an initial guess (the bench's current
 * frame) they are gated around the guessed path, the fit repeated and the gate tightened to 4σ
 * of the residuals; when the guess is too far off for the gate, a vote over rotations and
 * translations (coarseFrame) finds a start. Without a guess every pair is used (give a single
 * track then).
 */
import { EchotrailError } from '../errors.ts';
import { applyRigid, fitRigid2D, type RigidFit, type XY } from './rigid-fit.ts';
import { samplePath, type TimedPoint } from './path.ts';

export interface FrameAlignOptions {
  /** Starting frame: rotation (rad, counter-clockwise) and translation (m). Default: none, use every pair. */
  initial?: { rotationRad: number; translation: XY } | null;
  /** First gate radius around the guessed path, m (default 0.5). */
  gateM?: number;
  /** Gate-and-fit rounds after the first (default 3). */
  rounds?: number;
  /** Accept a straight path (see rigid-fit.ts). */
  allowCollinear?: boolean;
  /** Fewest pairs for a fit (default 10). */
  minPairs?: number;
}

export function resolveFrameAlignOptions(o: FrameAlignOptions = {}) {
  return { initial: o.initial ?? null, gateM: o.gateM ?? 0.5, rounds: o.rounds ?? 3, allowCollinear: o.allowCollinear ?? false, minPairs: o.minPairs ?? 10 };
}

export interface FrameAlignment extends RigidFit {
  /** Observations inside the commanded time span. */
  candidates: number;
  /** Of those, how many the final gate kept. */
  used: number;
}

/** What a frame fit cannot vouch for, in words for the user (the CLI and the dashboard show them). */
export function frameWarnings(fit: Pick<RigidFit, 'collinear'>): string[] {
  return fit.collinear ? ['the path is a straight line: any tracking lag along it went into the shift along the line, and only the cross-line offset and the rotation are measured; a 2-D path (circle, figure-eight, waypoints) separates them'] : [];
}

export function alignFrame(observed: TimedPoint[], commanded: TimedPoint[], options?: FrameAlignOptions): FrameAlignment {
  const o = resolveFrameAlignOptions(options);
  const pairs: { p: XY; q: XY }[] = [];
  let hint = 0;
  for (const ob of observed) {
    const c = samplePath(commanded, ob.timeS, hint);
    if (!c) continue;
    hint = c.segment;
    pairs.push({ p: { x: c.x, y: c.y }, q: { x: ob.x, y: ob.y } });
  }
  if (pairs.length < o.minPairs) throw new EchotrailError('E_CALIBRATION', `frame fit: only ${pairs.length} observations fall in the commanded path's time span (need ${o.minPairs}); check that both files come from the same run`);
  const fit = (sel: typeof pairs) => {
    if (sel.length < o.minPairs) throw new EchotrailError('E_CALIBRATION', `frame fit: only ${sel.length} observations lie within ${o.gateM} m of the commanded path as currently aligned (need ${o.minPairs}); give a track, or a better starting frame; nothing was saved`);
    return fitRigid2D(sel.map((s) => s.p), sel.map((s) => s.q), { allowCollinear: o.allowCollinear });
  };
  const near = (rot: number, t: XY, radius: number) => pairs.filter(({ p, q }) => {
    const m = applyRigid(p, rot, t);
    return Math.hypot(q.x - m.x, q.y - m.y) <= radius;
  });
  let sel = o.initial ? near(o.initial.rotationRad, o.initial.translation, o.gateM) : pairs;
  if (o.initial && sel.length < o.minPairs) {
    // The starting frame is too far off for the gate: find one by voting (see coarseFrame).
    const guess = coarseFrame(pairs, o.gateM);
    if (guess) sel = near(guess.rotationRad, guess.translation, o.gateM);
  }
  let result = fit(sel);
  for (let k = 0; k < o.rounds; k++) {
    // 4σ of a 2-D residual with per-axis σ keeps all but ~0.03% of true pairs (Rayleigh tail, common practice).
    sel = near(result.rotationRad, result.translation, Math.min(o.gateM, Math.max(4 * result.sigmaM, 0.02)));
    result = fit(sel);
  }
  return { ...result, candidates: pairs.length, used: sel.length };
}

/**
 * A starting frame when nothing better is known: for rotations every degree, every pair votes for
 * the translation q − R·p in a grid of `cellM` cells. The target's pairs agree on one cell at the
 * right rotation; a fixed echo's or clutter's pairs scatter as the commanded point moves. Returns
 * the best rotation with the mean translation of its winning cell (a Hough-style vote, common
 * practice), or null when no cell gathers 10 votes.
 */
export function coarseFrame(pairs: { p: XY; q: XY }[], cellM: number): { rotationRad: number; translation: XY } | null {
  let best: { votes: number; rotationRad: number; translation: XY } | null = null;
  for (let deg = -180; deg < 180; deg++) {
    const rot = (deg * Math.PI) / 180;
    const cells = new Map<string, { n: number; sx: number; sy: number }>();
    for (const { p, q } of pairs) {
      const m = applyRigid(p, rot, { x: 0, y: 0 });
      const tx = q.x - m.x;
      const ty = q.y - m.y;
      const key = `${Math.round(tx / cellM)},${Math.round(ty / cellM)}`;
      const c = cells.get(key) ?? { n: 0, sx: 0, sy: 0 };
      c.n++;
      c.sx += tx;
      c.sy += ty;
      cells.set(key, c);
    }
    for (const c of cells.values()) {
      if (!best || c.n > best.votes) best = { votes: c.n, rotationRad: rot, translation: { x: c.sx / c.n, y: c.sy / c.n } };
    }
  }
  return best && best.votes >= 10 ? { rotationRad: best.rotationRad, translation: best.translation } : null;
}
