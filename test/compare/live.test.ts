// The live figures must agree with the offline computation on the same data (deviation.ts,
// lag.ts); RMSE definition common practice. Inputs: the seeded analytic run of bench-run.ts.
import { describe, expect, it } from 'vitest';
import { comparisonFigures } from '../../bridge/server/protocol.ts';
import { LiveComparison } from '../../bridge/compare/live.ts';
import { deviations } from '../../bridge/compare/deviation.ts';
import { sampleAt } from '../../bridge/compare/timed-path.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import type { TrackUpdate } from '../../bridge/types.ts';
import { benchRun } from './bench-run.ts';

const path = waypointsToPath([
  { x: -1, y: 2, dwellS: 1 }, { x: 1, y: 2, speedMps: 0.4 }, { x: 1, y: 4, speedMps: 0.4 },
  { x: -1, y: 4, speedMps: 0.4 }, { x: -1, y: 2, speedMps: 0.4, dwellS: 1 },
]);

function toUpdate(r: TrackRow): TrackUpdate {
  return {
    timeS: r.timeS, id: r.id, status: r.status, x: r.x, y: r.y, vx: r.vx, vy: r.vy, speed: r.speed, headingRad: r.headingRad,
    pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 3, misses: 0,
    measurement: r.meas ? { timeS: r.timeS, x: r.meas.x, y: r.meas.y, rxx: r.meas.sxx, rxy: r.meas.sxy, ryy: r.meas.syy } : undefined,
  };
}

describe('LiveComparison', () => {
  const run = benchRun(path, { seed: 4, lagS: 0.3, ghost: { x: 2.5, y: 1 } });

  it('has no figures before data, and valid protocol messages after', () => {
    const live = new LiveComparison();
    const f0 = live.figures();
    expect([f0.samples, f0.rmseM, f0.trackId, f0.lagS]).toEqual([0, null, null, null]);
    live.setCommanded(path.points);
    for (const r of run.rows) live.update(toUpdate(r));
    expect(comparisonFigures.safeParse(live.figures()).success).toBe(true);
  });

  it('follows the target, not the ghost, and matches the offline RMSE and lag', () => {
    const live = new LiveComparison();
    live.setCommanded(path);
    for (const r of run.rows) live.update(toUpdate(r));
    const f = live.figures();
    expect(f.trackId).toBe(1);
    const mine = run.rows.filter((r) => r.id === 1 && r.status !== 'tentative');
    expect(f.samples).toBe(mine.length);
    const offline = deviations(path, mine).map((d) => d.positionM);
    expect(f.rmseM).toBeCloseTo(Math.sqrt(offline.reduce((a, b) => a + b * b, 0) / offline.length), 9);
    expect(f.maxErrorM).toBeCloseTo(Math.max(...offline), 9);
    // The simulated lag is 0.3 s; the tracker's own lag adds a little (≈ 0.1 s for this filter).
    expect(f.lagS!).toBeGreaterThan(0.25);
    expect(f.lagS!).toBeLessThan(0.5);
  });

  it('builds the path from positioner samples arriving with the updates', () => {
    const live = new LiveComparison();
    const rows = [...run.rows];
    for (let t = 0; t <= path.points[path.points.length - 1].timeS + 1e-9; t += 0.1) {
      const c = sampleAt(path, t);
      live.addPositioner({ timeS: t, cmdX: c.x, cmdY: c.y });
      while (rows.length && rows[0].timeS <= t + 0.2) live.update(toUpdate(rows.shift()!)); // updates run ahead a little
    }
    const f = live.figures();
    expect(f.trackId).toBe(1);
    // Every confirmed update of the target is used once its commanded time has arrived.
    expect(f.samples).toBe(run.rows.filter((r) => r.id === 1 && r.status !== 'tentative').length);
    expect(f.rmseM!).toBeLessThan(0.3);
  });

  it('compares updates that arrived before the commanded path once it comes', () => {
    const live = new LiveComparison({ maxPending: 1000 });
    for (const r of run.rows) live.update(toUpdate(r));
    expect(live.figures().samples).toBe(0);
    live.setCommanded(path);
    expect(live.figures().samples).toBe(run.rows.filter((r) => r.id === 1 && r.status !== 'tentative').length);
  });

  it('reset clears the figures but keeps the path', () => {
    const live = new LiveComparison();
    live.setCommanded(path);
    for (const r of run.rows) live.update(toUpdate(r));
    live.reset();
    expect(live.figures().samples).toBe(0);
    live.update(toUpdate(run.rows.find((r) => r.id === 1 && r.status === 'confirmed')!));
    expect(live.figures().samples).toBe(1);
  });
});

describe('LiveComparison on a long positioner-fed run', () => {
  // A square of 2 m sides at 0.4 m/s, sampled at 20 Hz; the track follows 0.3 s late with a small
  // deterministic wobble and reports at 4 Hz.
  const commandAt = (t: number): { x: number; y: number } => {
    const s = (t * 0.4) % 8;
    const leg = Math.floor(s / 2);
    const f = s - 2 * leg;
    return [{ x: -1 + f, y: 2 }, { x: 1, y: 2 + f }, { x: 1 - f, y: 4 }, { x: -1, y: 4 - f }][leg];
  };
  function feed(live: LiveComparison, seconds: number, trackUntilS = Infinity): void {
    for (let k = 0; k <= seconds * 20; k++) {
      const t = k / 20;
      const c = commandAt(t);
      live.addPositioner({ timeS: t, cmdX: c.x, cmdY: c.y });
      if (k % 5 === 0 && t > 1 && t <= trackUntilS) {
        const p = commandAt(t - 0.3);
        const row: TrackRow = {
          timeS: t, id: 1, status: 'confirmed', x: p.x + 0.02 * Math.sin(k), y: p.y + 0.02 * Math.cos(1.3 * k),
          vx: 0, vy: 0.4, speed: 0.4, headingRad: 0,
        };
        live.update(toUpdate(row));
      }
    }
  }

  it('keeps only the tail of the path, with the same figures as keeping all of it', () => {
    const trimmed = new LiveComparison();
    const whole = new LiveComparison({ trimChunk: Infinity, maxPathPoints: Infinity });
    feed(trimmed, 1200);
    feed(whole, 1200);
    expect(whole.pathPoints).toBeGreaterThan(20_000);
    // Lag window (240 samples at 4 Hz = 60 s) + max lag + slack, at 20 Hz, plus one trim chunk.
    expect(trimmed.pathPoints).toBeLessThan(2_500);
    expect(trimmed.figures()).toEqual(whole.figures());
    expect(trimmed.figures().lagS!).toBeCloseTo(0.3, 2);
  });

  it('after a reset (seek back in a replay) compares again as a fresh run would', () => {
    const seeked = new LiveComparison();
    feed(seeked, 300);
    seeked.reset();
    feed(seeked, 120);
    const fresh = new LiveComparison();
    feed(fresh, 120);
    expect(seeked.figures().samples).toBeGreaterThan(0);
    expect(seeked.figures()).toEqual(fresh.figures());
  });

  it('after a seek while paused, compares the re-sent tracks on the kept path before any new sample', () => {
    // The replay re-sends the window's track updates at once; positioner samples come only on Play.
    const live = new LiveComparison();
    feed(live, 60);
    live.reset();
    for (let t = 40; t <= 50; t += 0.25) {
      const p = commandAt(t - 0.3);
      live.update(toUpdate({ timeS: t, id: 1, status: 'confirmed', x: p.x, y: p.y, vx: 0, vy: 0.4, speed: 0.4, headingRad: 0 }));
    }
    expect(live.figures().samples).toBe(41);
    // Play resumes inside the kept span: the path goes on without a new start.
    live.addPositioner({ timeS: 50.05, cmdX: commandAt(50.05).x, cmdY: commandAt(50.05).y });
    expect(live.pathPoints).toBeGreaterThan(100);
  });

  it('after a seek forward past the kept path, starts the path again instead of bridging the gap', () => {
    const live = new LiveComparison();
    feed(live, 30);
    live.reset();
    const c = commandAt(200);
    live.addPositioner({ timeS: 200, cmdX: c.x, cmdY: c.y });
    expect(live.pathPoints).toBe(1);
  });

  it('stays bounded when the followed track is lost for long', () => {
    const live = new LiveComparison({ maxPathPoints: 3_000, trimChunk: 256 });
    feed(live, 600, 60);
    expect(live.pathPoints).toBeLessThanOrEqual(3_000);
    expect(live.figures().samples).toBeGreaterThan(0);
  });
});

describe('LiveComparison running-RMSE history', () => {
  it('keeps the running RMSE as it went, spaced and bounded, start of the run included', () => {
    const live = new LiveComparison({ historyStepS: 0.25, maxHistoryPoints: 50 });
    live.setCommanded([{ timeS: 0, x: -5, y: 2 }, { timeS: 100, x: 5, y: 2 }]);
    const upd = (t: number, off: number): TrackUpdate => ({
      timeS: t, id: 1, status: 'confirmed', x: -5 + 0.1 * t, y: 2 + off, vx: 0.1, vy: 0, speed: 0.1, headingRad: Math.PI / 2,
      pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 3, misses: 0,
    });
    // 0.1 m off for the first 10 s, on the path after: the running RMSE falls from 0.1 m.
    for (let t = 0; t <= 40; t += 0.1) live.update(upd(t, t < 10 ? 0.1 : 0));
    const h = live.history();
    const times = h.filter((_, i) => i % 2 === 0);
    const rmse = h.filter((_, i) => i % 2 === 1);
    expect(times.length).toBeLessThanOrEqual(50);
    expect(times[0]).toBeLessThan(0.5);
    expect(times.at(-1)).toBeGreaterThan(39);
    for (let i = 1; i < times.length; i++) expect(times[i] - times[i - 1]).toBeGreaterThanOrEqual(0.25 - 1e-9);
    expect(rmse[0]).toBeCloseTo(0.1, 9);
    // Its last point is the figure of the moment.
    expect(rmse.at(-1)).toBeCloseTo(live.figures().rmseM!, 12);
    live.reset();
    expect(live.history()).toEqual([]);
  });
});
