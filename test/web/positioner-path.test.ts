import { describe, expect, it } from 'vitest';
import type { PositionerWire, ServerMessage } from '../../bridge/server/protocol.ts';
import { applyMessage } from '../../web/src/stream/reduce.ts';
import { createState, firstCommandedPath } from '../../web/src/stream/state.ts';
import { matchPath } from '../../web/src/stream/path-match.ts';
import { errorSeries } from '../../web/src/stream/path-error.ts';
import { extendPositionerPath, POSITIONER_MIN_DT_S } from '../../web/src/stream/positioner-path.ts';

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

const scanOf = (positioner: PositionerWire[]): ServerMessage => ({
  type: 'scan', timeS: positioner[positioner.length - 1]?.timeS ?? 0, detections: [], updates: [], deletions: [], antennaAzimuthRad: null, positioner,
});
const sample = (timeS: number, x: number, target?: string): PositionerWire => ({ timeS, cmdX: x, cmdY: 2, ...(target ? { target } : {}) });

describe('paths built from several named positioners', () => {
  it('one unnamed positioner builds one unnamed path, samples closer than the minimum spacing left out', () => {
    const s = createState();
    expect(extendPositionerPath(s, [sample(0, 0), sample(0.01, 0.01), sample(0.1, 0.1)])).toBe(true);
    expect(s.commandedPaths).toEqual([{ target: '', path: [{ timeS: 0, x: 0, y: 2 }, { timeS: 0.1, x: 0.1, y: 2 }] }]);
    expect(POSITIONER_MIN_DT_S).toBeGreaterThan(0.01);
  });

  it('named positioners (two carriages) build a path each, under their names, and a ✕ each', () => {
    const s = createState();
    applyMessage(s, scanOf([sample(0, -1, '1'), sample(0, 1, '2')]));
    applyMessage(s, scanOf([sample(0.1, -0.9, '1'), sample(0.1, 0.9, '2')]));
    expect(s.commandedPaths.map((p) => [p.target, p.path.map((q) => q.x)])).toEqual([['1', [-1, -0.9]], ['2', [1, 0.9]]]);
    expect([...s.positioners].map(([k, p]) => [k, p.cmdX])).toEqual([['1', -0.9], ['2', 0.9]]);
    // Figures against carriage 2's path do not turn its path into one given whole.
    applyMessage(s, { type: 'comparison', figures: { timeS: 0.1, samples: 3, rmseM: 0.02, crossTrackM: 0, alongTrackM: 0, maxErrorM: 0.03, lagS: null, trackId: 7, pathId: '2' } });
    expect(s.commandedExplicit).toBe(false);
    applyMessage(s, scanOf([sample(0.2, 0.8, '2')]));
    expect(s.commandedPaths[1].path).toHaveLength(3);
  });

  it('a path given whole is never extended; a snapshot says which kind the paths are', () => {
    const s = createState();
    applyMessage(s, { type: 'commanded', path: [{ timeS: 0, x: 0, y: 1 }, { timeS: 5, x: 1, y: 1 }] });
    expect(extendPositionerPath(s, [sample(1, 0.3)])).toBe(false);
    expect(s.commandedPaths[0].path).toHaveLength(2);
    const snap = (commandedFrom: 'whole' | 'positioner'): ServerMessage => ({
      type: 'snapshot', timeS: 1, source: { kind: 'serial', state: 'live', name: 'p', badLines: 0, lastBad: null, detectionsPerSecond: 0, latencyMs: null, recording: null, recordingError: null },
      tracks: [], history: [], detections: [], fixedEchoes: [], commanded: [{ timeS: 0, x: -1, y: 2 }], commandedPaths: [{ target: 'A', path: [{ timeS: 0, x: -1, y: 2 }] }], commandedFrom, replay: null,
    });
    applyMessage(s, snap('positioner'));
    expect(s.commandedExplicit).toBe(false);
    applyMessage(s, scanOf([sample(1, -0.8, 'A')]));
    expect(s.commandedPaths).toEqual([{ target: 'A', path: [{ timeS: 0, x: -1, y: 2 }, { timeS: 1, x: -0.8, y: 2 }] }]);
    applyMessage(s, snap('whole'));
    expect(s.commandedExplicit).toBe(true);
  });
});
