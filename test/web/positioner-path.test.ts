import { describe, expect, it } from 'vitest';
import type { ServerMessage } from '../../bridge/server/protocol.ts';
import { applyMessage } from '../../web/src/stream/reduce.ts';
import { createState, firstCommandedPath } from '../../web/src/stream/state.ts';
import { matchPath } from '../../web/src/stream/path-match.ts';
import { errorSeries } from '../../web/src/stream/path-error.ts';

type Scan = Extract<ServerMessage, { type: 'scan' }>;
type Snapshot = Extract<ServerMessage, { type: 'snapshot' }>;

// A positioner moving along x at 0.2 m/s, 2 m in front of the radar; the track sits 5 cm off it.
const pos = (t: number) => ({ timeS: t, cmdX: 0.2 * t, cmdY: 2 });
const track = (t: number) => ({
  id: 3, timeS: t, x: 0.2 * t, y: 2.05, vx: 0.2, vy: 0, speed: 0.2, headingRad: Math.PI / 2,
  pxx: 0.01, pxy: 0, pyy: 0.01, status: 'confirmed' as const, quality: 0.9, hits: 10, misses: 0, moving: true,
});
function scan(t: number, extra: Partial<Scan> = {}): Scan {
  return { type: 'scan', timeS: t, detections: [], updates: [track(t)], deletions: [], antennaAzimuthRad: null, positioner: [pos(t - 0.1), pos(t)], ...extra };
}
function snapshot(commanded: { timeS: number; x: number; y: number }[], extra: Partial<Snapshot> = {}): Snapshot {
  return {
    type: 'snapshot', timeS: 1, source: null, replay: null, tracks: [], history: [], detections: [], fixedEchoes: [],
    commanded, ...extra,
  } as Snapshot;
}
const fig = { timeS: 5, samples: 103, rmseM: 0.05, crossTrackM: 0.05, alongTrackM: 0, maxErrorM: 0.05, lagS: 0, trackId: 3, pathId: 'positioner' };

describe('positioner-built commanded path', () => {
  it('grows with the scans, so the selected track is measured on the path the comparison uses', () => {
    const s = createState();
    // The snapshot holds the path as it was when the client joined: it ends at 1 s.
    applyMessage(s, snapshot([{ timeS: 0, x: 0, y: 2 }, { timeS: 1, x: 0.2, y: 2 }]));
    for (let t = 2; t <= 5; t += 0.5) applyMessage(s, scan(t));
    applyMessage(s, { type: 'comparison', figures: fig });
    const h = s.tracks.get(3)!.history;
    const m = matchPath(s, 3, h);
    expect(m).toMatchObject({ how: 'followed', reason: null });
    expect(m.path!.at(-1)!.timeS).toBe(5);
    const e = errorSeries(h, m.path!);
    expect(e.v.length).toBeGreaterThan(5);
    for (const v of e.v) expect(v).toBeCloseTo(0.05, 6);
  });

  it('starts a path from samples when the snapshot had none, and thins samples closer than 50 ms', () => {
    const s = createState();
    applyMessage(s, snapshot([]));
    applyMessage(s, scan(1, { positioner: [pos(1), pos(1.01), pos(1.06)] }));
    expect(s.commandedPaths).toHaveLength(1);
    expect(firstCommandedPath(s).map((p) => p.timeS)).toEqual([1, 1.06]);
  });

  it('never extends a path given whole', () => {
    const s = createState();
    const whole = [{ timeS: 0, x: 0, y: 2 }, { timeS: 3, x: 0.6, y: 2 }];
    applyMessage(s, snapshot([]));
    applyMessage(s, { type: 'commanded', path: whole });
    const v = s.commandedVersion;
    applyMessage(s, scan(4));
    expect(firstCommandedPath(s).at(-1)!.timeS).toBe(3);
    expect(s.commandedVersion).toBe(v);
  });

  it('stops extending once figures name a path given whole (a snapshot cannot tell)', () => {
    const s = createState();
    applyMessage(s, snapshot([{ timeS: 0, x: 0, y: 2 }, { timeS: 3, x: 0.6, y: 2 }]));
    applyMessage(s, { type: 'comparison', figures: { ...fig, pathId: 'commanded' } });
    applyMessage(s, scan(4));
    expect(firstCommandedPath(s).at(-1)!.timeS).toBe(3);
    expect(matchPath(s, 3, s.tracks.get(3)!.history).how).toBe('followed');
  });
});
