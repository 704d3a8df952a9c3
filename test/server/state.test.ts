import { describe, expect, it } from 'vitest';
import { LiveState } from '../../bridge/server/state.ts';
import { trackAt } from '../helpers/scripted-source.ts';

const det = (timeS: number) => ({ timeS, azimuthRad: 1, rangeM: 2, amplitude: 3 });

describe('LiveState', () => {
  it('keeps only the last recentDetectionsS of detections, and never more than the cap', () => {
    const s = new LiveState({ recentDetectionsS: 1, maxRecentDetections: 5 });
    for (let i = 0; i <= 20; i++) s.addDetection(det(i * 0.1));
    const kept = s.recentDetections().map((d) => d.timeS);
    expect(kept).toHaveLength(5);
    expect(kept[kept.length - 1]).toBeCloseTo(2.0);
    const t = new LiveState({ recentDetectionsS: 0.5, maxRecentDetections: 100 });
    for (let i = 0; i <= 20; i++) t.addDetection(det(i * 0.1));
    expect(Math.min(...t.recentDetections().map((d) => d.timeS))).toBeGreaterThanOrEqual(1.5 - 1e-9);
  });

  it('keeps a bounded history per track and forgets deleted tracks', () => {
    const s = new LiveState({ historyPoints: 3 });
    for (let i = 0; i < 10; i++) s.addUpdate(trackAt(1, i, i, 0));
    s.addUpdate(trackAt(2, 10, 5, 5));
    const k = [0.5, Math.PI / 2];
    expect(s.history()).toEqual([
      { id: 1, points: [7, 7, 0, 8, 8, 0, 9, 9, 0], kinematics: [...k, ...k, ...k] },
      { id: 2, points: [10, 5, 5], kinematics: k },
    ]);
    s.addDeletion({ timeS: 11, id: 1, reason: 'misses' });
    expect(s.tracks().map((t) => t.id)).toEqual([2]);
    expect(s.history().map((h) => h.id)).toEqual([2]);
  });

  it("carries the filter's speed and heading beside each history point", () => {
    const s = new LiveState();
    s.addUpdate({ ...trackAt(4, 1, 0, 1), speed: 0.3, headingRad: 1.1 });
    s.addUpdate({ ...trackAt(4, 2, 0.3, 1), speed: 0.35, headingRad: 1.2 });
    const [h] = s.history();
    expect(h.points).toEqual([1, 0, 1, 2, 0.3, 1]);
    expect(h.kinematics).toEqual([0.3, 1.1, 0.35, 1.2]);
    expect(h.kinematics.length / 2).toBe(h.points.length / 3);
  });

  it('evicts the least recently updated track beyond maxTracks', () => {
    const s = new LiveState({ maxTracks: 2 });
    s.addUpdate(trackAt(1, 0, 0, 0));
    s.addUpdate(trackAt(2, 1, 0, 0));
    s.addUpdate(trackAt(1, 2, 0, 0));
    s.addUpdate(trackAt(3, 3, 0, 0));
    expect(s.tracks().map((t) => t.id).sort()).toEqual([1, 3]);
  });

  it('strips measurement and NIS from the wire form of a track', () => {
    const s = new LiveState();
    const w = s.addUpdate({ ...trackAt(4, 1, 1, 1), nis: 2.1, measurement: { timeS: 1, x: 1, y: 1, rxx: 1, rxy: 0, ryy: 1 } });
    expect(Object.keys(w)).not.toContain('nis');
    expect(Object.keys(w)).not.toContain('measurement');
  });

  it('builds the commanded path from positioner samples, decimated and bounded, until a whole path arrives', () => {
    const s = new LiveState({ maxCommandedPoints: 100 });
    for (let i = 0; i < 1000; i++) s.addPositioner({ timeS: i * 0.01, cmdX: i, cmdY: 0 });
    // 10 ms samples, at least 50 ms apart, at most 100 points: the whole 10 s stays covered.
    const c = s.commanded;
    expect(c.length).toBeLessThanOrEqual(100);
    expect(c.length).toBeGreaterThan(50);
    expect(c[0].timeS).toBe(0);
    expect(c[c.length - 1].timeS).toBeGreaterThan(9.5);
    for (let i = 1; i < c.length; i++) expect(c[i].timeS - c[i - 1].timeS).toBeGreaterThan(0.05 - 1e-9);
    s.setCommanded([{ timeS: 0, x: 0, y: 0 }, { timeS: 1, x: 1, y: 1 }]);
    s.addPositioner({ timeS: 20, cmdX: 5, cmdY: 5 });
    expect(s.commanded).toHaveLength(2);
    s.reset();
    expect(s.commanded).toHaveLength(2);
    s.clearCommanded();
    expect(s.commanded).toEqual([]);
  });

  it('builds one path per named positioner, and says the paths come from positioner samples', () => {
    const s = new LiveState();
    expect(s.commandedFrom).toBeNull();
    for (let i = 0; i < 20; i++) {
      s.addPositioner({ timeS: i * 0.1, cmdX: -1 + i * 0.01, cmdY: 2, target: '1' });
      s.addPositioner({ timeS: i * 0.1, cmdX: 1 - i * 0.01, cmdY: 2, target: '2' });
    }
    expect(s.commandedFrom).toBe('positioner');
    expect(s.commandedPaths.map((p) => [p.target, p.path.length, p.path[p.path.length - 1].x])).toEqual([['1', 20, -0.81], ['2', 20, 0.81]]);
    // The first positioner's path is also `commanded`, for clients that know only one.
    expect(s.commanded).toBe(s.commandedPaths[0].path);
    // Whole paths replace them.
    s.setCommanded([{ timeS: 0, x: 0, y: 0 }, { timeS: 1, x: 1, y: 1 }], 'A');
    expect(s.commandedFrom).toBe('whole');
    expect(s.commandedPaths.map((p) => p.target)).toEqual(['A']);
  });

  it('keeps the positioner path evenly spaced over a long run, start included', () => {
    const s = new LiveState({ maxCommandedPoints: 100 });
    // An hour at 20 Hz: the path hits its cap many times.
    for (let i = 0; i < 72_000; i++) s.addPositioner({ timeS: i / 20, cmdX: i, cmdY: 0 });
    const c = s.commanded;
    expect(c.length).toBeLessThanOrEqual(100);
    expect(c[0].timeS).toBe(0);
    const gaps = c.slice(1).map((p, i) => p.timeS - c[i].timeS);
    // Even resolution: the widest gap (the start, if it was thinned repeatedly) within twice the narrowest.
    expect(Math.max(...gaps)).toBeLessThanOrEqual(2 * Math.min(...gaps) + 1e-9);
    const firstHalf = c.filter((p) => p.timeS < 1800).length;
    expect(Math.abs(firstHalf - (c.length - firstHalf))).toBeLessThanOrEqual(c.length * 0.2);
  });
});
