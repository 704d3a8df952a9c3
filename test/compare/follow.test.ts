// Choice of the followed track: nearest confirmed track within a gate, with hysteresis
// (common practice in track-to-truth association for evaluation).
import { describe, expect, it } from 'vitest';
import { TrackFollower } from '../../bridge/compare/follow.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';

const row = (timeS: number, id: number, x: number, status: TrackRow['status'] = 'confirmed'): TrackRow => ({
  timeS, id, status, x, y: 0, vx: 0, vy: 0, speed: 0, headingRad: 0,
});

describe('TrackFollower', () => {
  it('ignores tentative tracks and tracks outside the gate', () => {
    const f = new TrackFollower({ gateM: 0.5 });
    expect(f.offer(row(0, 1, 0.1, 'tentative'), 0, 0)).toBe(false);
    expect(f.offer(row(0, 2, 0.9), 0, 0)).toBe(false);
    expect(f.currentId).toBeNull();
    expect(f.offer(row(0.1, 1, 0.1), 0, 0)).toBe(true);
    expect(f.currentId).toBe(1);
  });

  it('keeps the followed track against a slightly closer rival, switches to a clearly closer one', () => {
    const f = new TrackFollower({ gateM: 1, switchMarginM: 0.2, memoryS: 0 });
    f.offer(row(0, 1, 0.3), 0, 0);
    expect(f.offer(row(0.1, 2, 0.2), 0, 0)).toBe(false); // 0.1 m closer: not enough
    expect(f.offer(row(0.2, 1, 0.4), 0, 0)).toBe(true);
    expect(f.offer(row(0.3, 2, 0.1), 0, 0)).toBe(true); // 0.3 m closer: takes over
    expect(f.switches.map((s) => [s.from, s.to])).toEqual([[null, 1], [1, 2]]);
  });

  it('with memory, a ghost passing close for one scan does not take over; a track closer for longer does', () => {
    const run = (memoryS: number) => {
      const f = new TrackFollower({ gateM: 1, switchMarginM: 0.2, memoryS });
      for (let t = 0; t < 3; t += 0.25) f.offer(row(t, 1, 0.1), 0, 0);
      // Track 1 is 0.5 m off for one scan while a ghost passes at 0.05 m once.
      f.offer(row(3, 1, 0.5), 0, 0);
      const ghost = f.offer(row(3.1, 9, 0.05), 0, 0);
      // Then track 1 stays 0.6 m off while track 3 holds 0.05 m.
      for (let t = 3.25; t < 8; t += 0.25) {
        f.offer(row(t, 1, 0.6), 0, 0);
        f.offer(row(t + 0.01, 3, 0.05), 0, 0);
      }
      return { ghost, final: f.currentId };
    };
    // Without memory the ghost wins on its one close scan (0.05 + 0.2 < 0.5)…
    expect(run(0).ghost).toBe(true);
    // …with 1 s of memory track 1's running distance is still ≈ 0.19 m then, so it keeps the role,
    // and the sustained 0.6 m against 0.05 m hands it to track 3 afterwards.
    expect(run(1)).toEqual({ ghost: false, final: 3 });
  });

  it('hands over to a new id when the old track goes stale (tracker restarted)', () => {
    const f = new TrackFollower({ staleS: 1 });
    f.offer(row(0, 1, 0.1), 0, 0);
    expect(f.offer(row(0.5, 7, 0.2), 0, 0)).toBe(false);
    expect(f.offer(row(2, 7, 0.2), 0, 0)).toBe(true);
    expect(f.currentId).toBe(7);
    f.reset();
    expect(f.currentId).toBeNull();
    expect(f.switches).toHaveLength(0);
  });

  it('drops a followed track that strays beyond the release distance, and can pick it up again', () => {
    const f = new TrackFollower({ gateM: 0.5, releaseM: 1 });
    expect(f.offer(row(0, 1, 0.2), 0, 0)).toBe(true);
    expect(f.offer(row(1, 1, 0.9), 0, 0)).toBe(true); // outside the gate but still followed
    expect(f.offer(row(2, 1, 1.5), 0, 0)).toBe(false); // diverged
    expect(f.currentId).toBeNull();
    expect(f.releases).toEqual([{ timeS: 2, id: 1, distanceM: 1.5 }]);
    expect(f.offer(row(3, 1, 0.3), 0, 0)).toBe(true); // back within the gate
  });
});
