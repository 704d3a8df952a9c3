// The run analysis end to end on seeded analytic runs (bench-run.ts): lag recovery (least squares,
// lag.ts), track hand-over, coverage and the time-range check. Expected values follow from the
// construction of the run (lag, break, ghost), not from earlier outputs.
import { describe, expect, it } from 'vitest';
import { analyse } from '../../bridge/compare/analyse.ts';
import { makeTimedPath } from '../../bridge/compare/timed-path.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { EchotrailError } from '../../bridge/errors.ts';
import { benchRun } from './bench-run.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';

const path = waypointsToPath([
  { x: -1, y: 2, dwellS: 1 }, { x: 1, y: 2, speedMps: 0.4 }, { x: 1, y: 4, speedMps: 0.4 },
  { x: -1, y: 4, speedMps: 0.4 }, { x: -1, y: 2, speedMps: 0.4, dwellS: 1 },
]);

describe('analyse', () => {
  const run = benchRun(path, { seed: 5, lagS: 0.4, breakAtS: 9, ghost: { x: 2.5, y: 1 } });
  const a = analyse([path], run.rows);

  it('follows the target across the id change and never the ghost', () => {
    expect(a.switches.map((s) => s.to)).toEqual([1, 2]);
    expect(a.followed.some((r) => r.id === 99)).toBe(false);
  });

  it('estimates the positioner lag plus the tracker lag, and aligning reduces the error', () => {
    // Positioner lag 0.4 s by construction; the CV filter adds a little (it trails on corners).
    expect(a.lag.lagS!).toBeGreaterThan(0.38);
    expect(a.lag.lagS!).toBeLessThan(0.55);
    expect(a.whole.filtered.aligned.position.rmse!).toBeLessThan(0.6 * a.whole.filtered.noLag.position.rmse!);
    // Without alignment a late track is behind: along-track mean ≈ −speed × lag = −0.16 m on moving legs.
    const move = a.perLeg.find((l) => l.leg.kind === 'move')!;
    expect(move.filtered.noLag.along.mean!).toBeLessThan(-0.1);
  });

  it('smoothed beats filtered, and coverage reflects the 1 s outage plus start-up', () => {
    expect(a.whole.smoothed!.aligned.position.rmse!).toBeLessThan(a.whole.filtered.aligned.position.rmse!);
    // Lost: about 1 s of the break plus two tentative scans after each (re)start, of a 22 s run.
    expect(a.coverage.confirmedFraction).toBeGreaterThan(0.85);
    expect(a.coverage.confirmedFraction).toBeLessThan(0.97);
  });

  it('counts the ghost as a false track in GOSPA (c²/2 = 0.5 m² with c = 1 m)', () => {
    expect(a.setSummary.meanFalse!).toBeGreaterThan(0.45);
    expect(a.setSummary.meanFalse!).toBeLessThan(0.55);
  });

  it('refuses time ranges that do not overlap, suggesting milliseconds where it fits', () => {
    const msPath = makeTimedPath(path.points.map((p) => ({ ...p, timeS: p.timeS * 1000 })));
    try {
      analyse([msPath], run.rows);
      throw new Error('expected a failure');
    } catch (e) {
      expect(e).toBeInstanceOf(EchotrailError);
      expect((e as EchotrailError).code).toBe('E_PATH');
      expect((e as EchotrailError).message).toMatch(/time ranges do not match.*commanded times look like milliseconds/);
    }
  });

  it('says so when no track comes near the commanded path (wrong frame, wrong file)', () => {
    const far = run.rows.map((r) => ({ ...r, x: r.x + 5 }));
    expect(() => analyse([path], far)).toThrow(/no confirmed track came within 1 m of the commanded path/);
  });
});

describe('analyse with several carriages', () => {
  // Two carriages crossing at 8 s: carriage 2's own track only starts after the crossing, while
  // carriage 1's passes within a metre of carriage 2's command from about 6 s.
  const A = makeTimedPath([{ timeS: 0, x: -1.5, y: 2.4 }, { timeS: 16, x: 1.5, y: 3.6 }], 'A');
  const B = makeTimedPath([{ timeS: 0, x: 1.5, y: 2.4 }, { timeS: 16, x: -1.5, y: 3.6 }], 'B');
  const on = (p: typeof A, t: number) => ({ x: p.points[0].x + ((p.points[1].x - p.points[0].x) * t) / 16, y: p.points[0].y + ((p.points[1].y - p.points[0].y) * t) / 16 });
  const row = (id: number, t: number, p: { x: number; y: number }) => ({ timeS: t, id, status: 'confirmed' as const, x: p.x, y: p.y, vx: 0, vy: 0, speed: 0.2, headingRad: 0 });
  const rows: TrackRow[] = [];
  for (let t = 0; t <= 14; t += 0.25) {
    rows.push(row(5, t, on(A, t)));
    if (t >= 9) rows.push(row(6, t + 0.001, { x: on(B, t).x, y: on(B, t).y + 0.03 }));
  }

  it("follows each carriage's own track: the other carriage's never counts against it", () => {
    const b = analyse([B, A], rows);
    expect([...new Set(b.followed.map((r) => r.id))]).toEqual([6]);
    expect(b.whole.filtered.noLag.position.max!).toBeLessThan(0.05);
    // Alone, B's follower would take carriage 1's track while it passes.
    const alone = analyse([B], rows);
    expect(alone.followed.some((r) => r.id === 5)).toBe(true);
  });

  it('the set figures (OSPA/GOSPA) do not depend on which target is detailed: each target at its own lag', () => {
    const a = analyse([A, B], rows);
    const b = analyse([B, A], rows);
    expect(b.setSummary.meanGospaM!).toBeCloseTo(a.setSummary.meanGospaM!, 9);
    expect(b.setSummary.meanOspaM!).toBeCloseTo(a.setSummary.meanOspaM!, 9);
  });
});
