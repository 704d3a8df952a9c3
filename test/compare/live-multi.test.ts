// Several commanded paths at once (live-multi.ts): each path follows its own track.
import { describe, expect, it } from 'vitest';
import { MultiPathComparison } from '../../bridge/compare/live-multi.ts';
import { LiveComparison } from '../../bridge/compare/live.ts';
import { comparisonFigures, POSITIONER_PATH_ID } from '../../bridge/server/protocol.ts';
import type { TrackUpdate } from '../../bridge/types.ts';
describe('MultiPathComparison', () => {
  // Two carriages crossing as in the demo: A (-1.5, 2.4) → (1.5, 3.6), B mirrored, 16 s each.
  const A = [{ timeS: 0, x: -1.5, y: 2.4 }, { timeS: 16, x: 1.5, y: 3.6 }];
  const B = [{ timeS: 0, x: 1.5, y: 2.4 }, { timeS: 16, x: -1.5, y: 3.6 }];
  const at = (p: typeof A, t: number) => ({ x: p[0].x + ((p[1].x - p[0].x) * t) / 16, y: p[0].y + ((p[1].y - p[0].y) * t) / 16 });
  const upd = (id: number, t: number, p: { x: number; y: number }, dx: number): TrackUpdate => ({
    timeS: t, id, status: 'confirmed', x: p.x + dx, y: p.y, vx: 0, vy: 0, speed: 0.2, headingRad: 0,
    pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 3, misses: 0,
  });

  /** Both carriages' paths given whole, named '1' and '2'. */
  const twoCarriages = () => {
    const live = new MultiPathComparison();
    live.setCommanded(A, '1');
    live.setCommanded(B, '2');
    return live;
  };

  it('compares each track with the path it follows, one set of figures per path', () => {
    const live = twoCarriages();
    for (let t = 0; t <= 8; t += 0.25) {
      live.update(upd(5, t, at(A, t), 0.01));
      live.update(upd(6, t, at(B, t), -0.03));
    }
    const f = live.figures();
    expect(f.map((x) => [x.pathId, x.trackId])).toEqual([['1', 5], ['2', 6]]);
    expect(f[0].rmseM).toBeLessThan(0.02);
    // The second carriage's track is measured against its own path (3 cm), not the first one's (metres).
    expect(f[1].rmseM).toBeCloseTo(0.03, 2);
    for (const x of f) expect(comparisonFigures.safeParse(x).success).toBe(true);
  });

  it('builds one path from positioner samples unless whole paths are given, and keeps it through a reset', () => {
    const live = new MultiPathComparison();
    for (let t = 0; t <= 2; t += 0.1) live.addPositioner({ timeS: t, cmdX: at(A, t).x, cmdY: at(A, t).y });
    expect(live.paths).toEqual([POSITIONER_PATH_ID]);
    live.reset();
    expect(live.paths).toEqual([POSITIONER_PATH_ID]);
    live.setCommanded(B, '2');
    live.addPositioner({ timeS: 3, cmdX: 0, cmdY: 3 });
    expect(live.paths).toEqual(['2']);
  });

  it("never counts the track another path follows (the crossing carriages' tracks pass close)", () => {
    const live = twoCarriages();
    // Carriage 2's own track only shows after the crossing (8 s); carriage 1's passes within a
    // metre of carriage 2's command from about 6 s.
    for (let t = 0; t <= 14; t += 0.25) {
      live.update(upd(5, t, at(A, t), 0.01));
      if (t >= 9) live.update(upd(6, t, at(B, t), -0.03));
    }
    const f = live.figures();
    expect(f.map((x) => [x.pathId, x.trackId])).toEqual([['1', 5], ['2', 6]]);
    expect(f[1].maxErrorM).toBeCloseTo(0.03, 6);
  });

  it('a track ahead of its positioner (negative lag) is still compared as the samples come', () => {
    const live = new LiveComparison({ lagEvery: 5 });
    let counted = 0;
    for (let i = 0; i <= 150; i++) {
      const t = i * 0.1;
      live.addPositioner({ timeS: t, cmdX: at(A, t).x, cmdY: at(A, t).y });
      // The track is where the command will be 0.3 s later.
      if (t >= 0.5) live.update(upd(5, t, at(A, t + 0.3), 0));
      if (i % 50 === 0 && i > 0) {
        const n = live.figures().samples;
        expect(n).toBeGreaterThan(counted);
        counted = n;
      }
    }
    expect(live.figures().lagS).toBeLessThan(-0.2);
    // All but the updates waiting for the command 0.3 s ahead of the last sample.
    expect(live.figures().samples).toBeGreaterThan(140);
  });

  it('named positioners (pos … id=) build a path each, under the names a whole path would have', () => {
    const live = new MultiPathComparison();
    for (let t = 0; t <= 8; t += 0.1) {
      live.addPositioner({ timeS: t, cmdX: at(A, t).x, cmdY: at(A, t).y, target: '1' });
      live.addPositioner({ timeS: t, cmdX: at(B, t).x, cmdY: at(B, t).y, target: '2' });
      if (t >= 0.5) {
        live.update(upd(5, t - 0.05, at(A, t - 0.05), 0.01));
        live.update(upd(6, t - 0.05, at(B, t - 0.05), -0.03));
      }
    }
    expect(live.paths).toEqual(['1', '2']);
    const f = live.figures();
    expect(f.map((x) => [x.pathId, x.trackId])).toEqual([['1', 5], ['2', 6]]);
    expect(f[1].rmseM).toBeCloseTo(0.03, 2);
  });
});
