import { describe, expect, it } from 'vitest';
import type { ServerMessage, TrackWire } from '../../bridge/server/protocol.ts';
import { applyFrame } from '../../web/src/stream/client.ts';
import { applyMessage } from '../../web/src/stream/reduce.ts';
import { createState, defaultLimits, firstCommandedPath, loadFlatHistory } from '../../web/src/stream/state.ts';
import { HistoryRing } from '../../web/src/stream/ring.ts';
import { trackRows } from '../../web/src/stream/sort.ts';

const track = (id: number, t: number, x = 1, y = 2): TrackWire => ({
  timeS: t, id, status: 'confirmed', x, y, vx: 0.5, vy: 0, speed: 0.5, headingRad: Math.PI / 2,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.8, moving: true, hits: 3, misses: 0,
});
const scan = (t: number, updates: TrackWire[], extra: Partial<Extract<ServerMessage, { type: 'scan' }>> = {}): ServerMessage => ({
  type: 'scan', timeS: t, detections: [], updates, deletions: [], antennaAzimuthRad: null, positioner: [], ...extra,
});
const source = { kind: 'replay' as const, state: 'playing' as const, name: 's', badLines: 0, lastBad: null,
  detectionsPerSecond: 10, latencyMs: 2, recording: null, recordingError: null };

describe('applyMessage', () => {
  it('builds tracks and their history from scans', () => {
    const s = createState();
    applyMessage(s, scan(0.1, [track(4, 0.1, 1, 1)]));
    applyMessage(s, scan(0.2, [track(4, 0.2, 1.05, 1)]));
    const t = s.tracks.get(4)!;
    expect(t.history.length).toBe(2);
    expect(t.latest.x).toBe(1.05);
    expect(t.firstSeenS).toBe(0.1);
    expect(s.timeS).toBe(0.2);
  });

  it('ignores a repeated update at the same time in the history but keeps it as latest', () => {
    const s = createState();
    applyMessage(s, scan(1, [track(1, 1, 0, 1)]));
    applyMessage(s, scan(1, [{ ...track(1, 1, 0, 1.1), status: 'coasting' }]));
    expect(s.tracks.get(1)!.history.length).toBe(1);
    expect(s.tracks.get(1)!.latest.status).toBe('coasting');
  });

  it('removes deleted tracks', () => {
    const s = createState();
    applyMessage(s, scan(1, [track(1, 1), track(2, 1)]));
    applyMessage(s, scan(1.1, [], { deletions: [{ timeS: 1.1, id: 1, reason: 'misses' }] }));
    expect([...s.tracks.keys()]).toEqual([2]);
  });

  it('turns detections into x/y with azimuth clockwise from +y and prunes old ones', () => {
    const s = createState();
    applyMessage(s, scan(0, [], { detections: [{ timeS: 0, azimuthRad: Math.PI / 2, rangeM: 2, amplitude: 1 }] }));
    expect(s.detections[0].x).toBeCloseTo(2);
    expect(s.detections[0].y).toBeCloseTo(0);
    expect(s.detections[0].fixed).toBe(false);
    applyMessage(s, scan(defaultLimits.detectionAgeS + 1, []));
    expect(s.detections).toHaveLength(0);
  });

  it('restarts the picture on a snapshot, loading its history', () => {
    const s = createState();
    applyMessage(s, scan(5, [track(9, 5)]));
    const epoch = s.epoch;
    applyMessage(s, {
      type: 'snapshot', timeS: 2, source, tracks: [track(3, 2, 0, 2)],
      history: [{ id: 3, points: [1, 0, 1, 1.5, 0, 1.5, 2, 0, 2] }], detections: [], fixedEchoes: [], commanded: [],
      replay: { sessionId: 'a', durationS: 10, positionS: 2, speed: 1, playing: false, loop: false },
    });
    expect(s.epoch).toBe(epoch + 1);
    expect([...s.tracks.keys()]).toEqual([3]);
    expect(s.tracks.get(3)!.history.length).toBe(3);
    expect(s.tracks.get(3)!.firstSeenS).toBe(1);
    expect(s.replay?.playing).toBe(false);
    expect(s.timeS).toBe(2);
  });

  it('counts a track\'s age from its start when the bridge sends it, not from the history a seek re-sends', () => {
    const s = createState();
    // After a seek to 40 s the snapshot holds only the last seconds of a track that began at 12 s.
    applyMessage(s, {
      type: 'snapshot', timeS: 40, source, tracks: [{ ...track(3, 40, 0, 2), startS: 12 }],
      history: [{ id: 3, points: [38, 0, 1.9, 39, 0, 1.95, 40, 0, 2] }], detections: [], fixedEchoes: [], commanded: [],
      replay: { sessionId: 'a', durationS: 60, positionS: 40, speed: 1, playing: true, loop: false },
    });
    expect(s.tracks.get(3)!.firstSeenS).toBe(12);
    // A track first met in a scan also takes its start from the wire.
    applyMessage(s, scan(41, [{ ...track(7, 41), startS: 30.5 }]));
    expect(s.tracks.get(7)!.firstSeenS).toBe(30.5);
  });

  it('treats a scan far behind the latest time as a jump back', () => {
    const s = createState();
    applyMessage(s, scan(10, [track(1, 10)]));
    applyMessage(s, scan(3, [track(2, 3)]));
    expect([...s.tracks.keys()]).toEqual([2]);
    expect(s.timeS).toBe(3);
  });

  it('follows the replay clock after a seek back even when a scan carries a stale, higher time', () => {
    const s = createState();
    applyMessage(s, scan(59, [track(1, 59)]));
    applyMessage(s, {
      type: 'snapshot', timeS: 10, source, tracks: [track(2, 10)], history: [], detections: [], fixedEchoes: [], commanded: [],
      replay: { sessionId: 'a', durationS: 60, positionS: 10, speed: 1, playing: true, loop: false },
    });
    // A bridge that kept its highest time sends 59 with content of 10.2 s.
    applyMessage(s, scan(59, [track(2, 10.2)]));
    expect(s.timeS).toBeCloseTo(10.2, 9);
    expect(trackRows(s)[0].ageS).toBeCloseTo(0.2, 9);
  });

  it('keeps comparison figures, commanded path, antenna and positioner', () => {
    const s = createState();
    const figures = { timeS: 1, samples: 10, rmseM: 0.02, crossTrackM: 0.01, alongTrackM: -0.01, maxErrorM: 0.05, lagS: 0.1, trackId: 1 };
    applyMessage(s, { type: 'comparison', figures });
    applyMessage(s, { type: 'commanded', path: [{ timeS: 0, x: 0, y: 1 }, { timeS: 1, x: 1, y: 1 }] });
    applyMessage(s, scan(1, [], { antennaAzimuthRad: 1.2, positioner: [{ timeS: 1, cmdX: 0.5, cmdY: 1 }] }));
    expect(s.comparison).toEqual(figures);
    expect(s.comparisonHistory).toHaveLength(1);
    expect(firstCommandedPath(s)).toHaveLength(2);
    expect(s.commandedVersion).toBe(1);
    expect(s.antennaAzimuthRad).toBe(1.2);
    expect(s.positioners.get('')?.cmdX).toBe(0.5);
  });
});

describe('running-RMSE history in a snapshot', () => {
  it('refills the comparison charts, per path, in time order', () => {
    const s = createState();
    applyMessage(s, {
      type: 'snapshot', timeS: 25, source, tracks: [], history: [], detections: [], fixedEchoes: [], commanded: [], replay: null,
      comparisonHistory: [{ pathId: '1', points: [0.5, 0.2, 1, 0.15] }, { pathId: '2', points: [0.7, 0.05] }],
    });
    expect(s.comparisonHistory.map((f) => [f.pathId, f.timeS, f.rmseM])).toEqual([['1', 0.5, 0.2], ['2', 0.7, 0.05], ['1', 1, 0.15]]);
    // A snapshot without it (an older bridge, or nothing compared yet) leaves the charts empty.
    applyMessage(s, { type: 'snapshot', timeS: 1, source, tracks: [], history: [], detections: [], fixedEchoes: [], commanded: [], replay: null });
    expect(s.comparisonHistory).toEqual([]);
  });
});

describe('running-RMSE points in comparison messages', () => {
  it('adds the points a message brings after those the chart holds, per path', () => {
    const s = createState();
    const figures = { timeS: 2, samples: 10, rmseM: 0.02, crossTrackM: 0.01, alongTrackM: 0, maxErrorM: 0.05, lagS: null, trackId: 1, pathId: '1' };
    applyMessage(s, { type: 'comparison', figures, recent: [1, 0.03, 1.5, 0.025, 2, 0.02] });
    // A joining client's snapshot and the next message may overlap: the points held stay once.
    applyMessage(s, { type: 'comparison', figures: { ...figures, timeS: 3 }, recent: [2, 0.02, 2.5, 0.019, 3, 0.018] });
    applyMessage(s, { type: 'comparison', figures: { ...figures, pathId: '2' }, recent: [2, 0.1] });
    expect(s.comparisonHistory.map((f) => [f.pathId, f.timeS])).toEqual([['1', 1], ['1', 1.5], ['1', 2], ['1', 2.5], ['1', 3], ['2', 2]]);
    // A message without points (an older bridge) adds its figures as one point.
    applyMessage(s, { type: 'comparison', figures: { ...figures, timeS: 4 } });
    expect(s.comparisonHistory.at(-1)?.timeS).toBe(4);
  });
});

describe('applyFrame', () => {
  it('applies a valid frame', () => {
    const s = createState();
    expect(applyFrame(s, JSON.stringify({ type: 'hello', protocol: 1, server: 'bridge 0.1' }))).toBe(true);
    expect(s.serverName).toBe('bridge 0.1');
  });

  it('counts and refuses frames that are not JSON or fail the schema', () => {
    const s = createState();
    expect(applyFrame(s, '{nope')).toBe(false);
    expect(applyFrame(s, JSON.stringify({ type: 'scan', timeS: 'soon' }))).toBe(false);
    expect(applyFrame(s, JSON.stringify({ type: 'hello', protocol: 2, server: 'x' }))).toBe(false);
    expect(s.invalidFrames).toBe(3);
    expect(s.lastInvalid).toMatch(/protocol/);
  });
});

describe('loadFlatHistory', () => {
  it('derives speed and heading by differences', () => {
    const r = new HistoryRing(10);
    loadFlatHistory(r, [0, 0, 0, 1, 3, 4, 2, 3, 4]);
    expect(Number.isNaN(r.at(0).speed)).toBe(true);
    expect(r.at(1).speed).toBeCloseTo(5);
    expect(r.at(1).headingRad).toBeCloseTo(Math.atan2(3, 4));
    expect(r.at(2).speed).toBe(0);
  });

  it("takes the filter's speed and heading when the bridge sends them, one pair per point", () => {
    const r = new HistoryRing(10);
    loadFlatHistory(r, [0, 0, 0, 1, 3, 4], [0.2, 1.0, 0.3, 1.5]);
    expect(r.at(0).speed).toBe(0.2);
    expect(r.at(1).headingRad).toBe(1.5);
    // A mismatched array is ignored: differences again.
    loadFlatHistory(r, [0, 0, 0, 1, 3, 4], [0.2]);
    expect(r.at(1).speed).toBeCloseTo(5);
  });
});
