// ClockGuard: one stale line is refused, a restart is confirmed only by consecutive earlier lines.
import { describe, expect, it } from 'vitest';
import { ClockGuard, type GuardStep } from '../../bridge/ingest/clock-guard.ts';

/** Feeds times (each line is its own number) and collects what passes and what is refused. */
function feed(times: number[], guard = new ClockGuard<number>(2, 3)) {
  const accepted: number[] = [];
  const refused: [number, number][] = [];
  const restarts: number[] = [];
  times.forEach((t, i) => {
    const step: GuardStep<number> = guard.push(i + 1, t);
    for (const r of step.refused) refused.push([r.item, step.refusedFromS]);
    if (step.restart) restarts.push(step.accepted[0]);
    accepted.push(...step.accepted);
  });
  return { accepted, refused, restarts, guard };
}

describe('ClockGuard', () => {
  it('refuses one old line among good ones and keeps the lines around it', () => {
    const f = feed([81.4, 81.5, 81.6, 1.0, 81.7, 81.8]);
    expect(f.accepted).toEqual([1, 2, 3, 5, 6]);
    expect(f.refused).toEqual([[4, 81.6]]);
    expect(f.restarts).toEqual([]);
  });

  it('tolerates small disorder within the margin', () => {
    const f = feed([10, 10.5, 9.0, 10.6]);
    expect(f.accepted).toEqual([1, 2, 3, 4]);
    expect(f.refused).toEqual([]);
  });

  it('confirms a restart with three consistent earlier lines and passes them all on, in order', () => {
    const f = feed([81.5, 81.6, 0.1, 0.2, 0.3, 0.4]);
    expect(f.accepted).toEqual([1, 2, 3, 4, 5, 6]);
    expect(f.restarts).toEqual([3]);
    expect(f.refused).toEqual([]);
    expect(f.guard.latestS).toBe(0.4);
  });

  it('two stale lines are not a restart; stale lines inconsistent with each other never confirm one', () => {
    expect(feed([50, 1, 1.1, 50.1]).refused.map((r) => r[0])).toEqual([2, 3]);
    const f = feed([50, 1, 20, 40, 50.1]);
    expect(f.restarts).toEqual([]);
    expect(f.refused.map((r) => r[0])).toEqual([2, 3, 4]);
    expect(f.accepted).toEqual([1, 5]);
  });

  it('holds at most confirmLines - 1 lines, and drain refuses them', () => {
    const g = new ClockGuard<number>(2, 3);
    g.push(0, 100);
    for (let i = 1; i < 1000; i++) {
      g.push(i, (i % 2) * 40); // alternating 0 and 40: each stale, never consistent
      expect(g.heldCount).toBeLessThanOrEqual(2);
    }
    expect(g.drain().length).toBe(1);
    expect(g.heldCount).toBe(0);
  });

  it('passes lines without a time straight on', () => {
    const g = new ClockGuard<string>();
    expect(g.push('x', null)).toMatchObject({ accepted: ['x'], refused: [], restart: false });
  });
});
