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
    const f = new TrackFollower({ gateM: 1, switchMarginM: 0.2 });
    f.offer(row(0, 1, 0.3), 0, 0);
    expect(f.offer(row(0.1, 2, 0.2), 0, 0)).toBe(false); // 0.1 m closer: not enough
    expect(f.offer(row(0.2, 1, 0.4), 0, 0)).toBe(true);
    expect(f.offer(row(0.3, 2, 0.1), 0, 0)).toBe(true); // 0.3 m closer: takes over
    expect(f.switches.map((s) => [s.from, s.to])).toEqual([[null, 1], [1, 2]]);
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
