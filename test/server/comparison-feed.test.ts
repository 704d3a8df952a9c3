import { describe, expect, it } from 'vitest';
import { ComparisonFeed } from '../../bridge/server/comparison-feed.ts';
import type { LiveComparisonLike } from '../../bridge/server/deps.ts';
import type { ComparisonFigures } from '../../bridge/server/protocol.ts';

/** A comparison whose running RMSE is whatever the test appends: flat [t, rmse, …] per path. */
class FakeComparison implements LiveComparisonLike {
  readonly calls: string[] = [];
  readonly points = new Map<string, number[]>();
  add(pathId: string, t: number, rmse: number): void {
    this.points.set(pathId, [...(this.points.get(pathId) ?? []), t, rmse]);
  }
  commanded(): void { this.calls.push('commanded'); }
  positioner(): void { this.calls.push('positioner'); }
  update(): void { this.calls.push('update'); }
  deletion(): void { this.calls.push('deletion'); }
  figures(): ComparisonFigures[] {
    return [...this.points.keys()].map((pathId) => ({ timeS: 0, samples: 1, rmseM: 0, crossTrackM: null, alongTrackM: null, maxErrorM: null, lagS: null, trackId: 1, pathId }));
  }
  history(): { pathId: string; points: number[] }[] {
    return [...this.points].map(([pathId, points]) => ({ pathId, points }));
  }
  historyAfter(pathId: string, afterS: number): number[] {
    const p = this.points.get(pathId) ?? [];
    const out: number[] = [];
    for (let i = 0; i < p.length; i += 2) if (p[i] > afterS) out.push(p[i], p[i + 1]);
    return out;
  }
  reset(): void { this.calls.push('reset'); }
  restart(): void { this.calls.push('restart'); this.points.clear(); }
}

describe('ComparisonFeed', () => {
  it('each message carries only the running-RMSE points since the last message of its path', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    c.add('a', 1, 0.1);
    c.add('a', 2, 0.2);
    expect(feed.messages().map((m) => m.recent)).toEqual([[1, 0.1, 2, 0.2]]);
    expect(feed.messages().map((m) => m.recent)).toEqual([undefined]);
    c.add('a', 3, 0.3);
    c.add('b', 3, 0.5);
    expect(feed.messages().map((m) => [m.figures.pathId, m.recent])).toEqual([['a', [3, 0.3]], ['b', [3, 0.5]]]);
  });

  it('a session seek leaves the figures stale until settle(); settle() goes on from the end of the history', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    c.add('a', 1, 0.1);
    feed.resetForSeek(false);
    expect(c.calls).toEqual(['reset']);
    expect(feed.messages()).toEqual([]);
    expect(feed.history()).toEqual([]);
    const fresh = new FakeComparison();
    fresh.add('a', 1, 0.1);
    fresh.add('a', 2, 0.2);
    feed.replace(fresh);
    feed.settle();
    expect(feed.current).toBe(fresh);
    expect(feed.history()).toEqual([{ pathId: 'a', points: [1, 0.1, 2, 0.2] }]);
    // The resync's snapshot carried both points: the next message has none of them.
    expect(feed.messages().map((m) => m.recent)).toEqual([undefined]);
  });

  it('a re-tracking seek (detections CSV) does not make the figures stale', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    c.add('a', 1, 0.1);
    feed.resetForSeek(true);
    expect(feed.history()).toHaveLength(1);
    expect(feed.messages()).toHaveLength(1);
  });

  it('restart() forgets what was sent: a new run starts its chart from the beginning', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    c.add('a', 5, 0.1);
    feed.messages();
    feed.restart();
    c.add('a', 1, 0.4);
    expect(feed.messages().map((m) => m.recent)).toEqual([[1, 0.4]]);
  });

  it('restart() during a rebuilding seek does not leave the new run\'s figures stale', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    feed.resetForSeek(false); // a session seek: stale until its rebuild settles
    feed.restart(); // another source switched in before it did
    c.add('a', 1, 0.2);
    expect(feed.messages()).toHaveLength(1);
    expect(feed.history()).toHaveLength(1);
  });

  it('passes records through, and without a comparison does nothing at all', () => {
    const c = new FakeComparison();
    const feed = new ComparisonFeed(c);
    feed.commanded([{ timeS: 0, x: 0, y: 0 }]);
    feed.positioner({ timeS: 0, cmdX: 0, cmdY: 0 });
    feed.update({ timeS: 0, id: 1 } as never);
    feed.deletion({ timeS: 0, id: 1, reason: 'misses' });
    expect(c.calls).toEqual(['commanded', 'positioner', 'update', 'deletion']);
    const none = new ComparisonFeed(null);
    none.update({ timeS: 0, id: 1 } as never);
    none.resetForSeek(false);
    none.settle();
    expect(none.messages()).toEqual([]);
    expect(none.history()).toEqual([]);
  });
});
