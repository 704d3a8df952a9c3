import { describe, expect, it } from 'vitest';
import { assign, type GatedPair } from '../../bridge/tracking/assignment.ts';
import { createFilter } from '../../bridge/tracking/filter.ts';
import { gateBatch } from '../../bridge/tracking/gating.ts';
import { SeedPool } from '../../bridge/tracking/seeds.ts';
import { Tracker } from '../../bridge/tracking/tracker.ts';
import { resolveTrackerParts } from '../../bridge/tracking/tracker-parts.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { SCENARIOS } from '../../bridge/sim/scenarios.ts';
import type { TrackerOutput, TrackUpdate } from '../../bridge/types.ts';

const run = simulateRun({ ...SCENARIOS['rail-sweep'], durationS: 40, seed: 3 });

function track(t: Tracker): { updates: TrackUpdate[]; out: TrackerOutput[] } {
  const out: TrackerOutput[] = [];
  for (const d of run.detections) out.push(t.push(d));
  out.push(t.flush());
  return { updates: out.flatMap((o) => o.updates), out };
}

describe('tracker parts', () => {
  it('defaults to echotrail’s own filter, gate, associator, initiator and deleter', () => {
    const p = resolveTrackerParts();
    expect(p.createFilter).toBe(createFilter);
    expect(p.gate).toBe(gateBatch);
    expect(p.associate).toBe(assign);
    expect(p.createInitiator(1.5, 2.5, 0)).toBeInstanceOf(SeedPool);
  });

  it('runs a given associator in place of the default, and the same answer gives the same tracks', () => {
    let calls = 0;
    const counting = (pairs: readonly GatedPair[] | GatedPair[], miss: (id: number) => number) => {
      calls++;
      return assign(pairs, miss);
    };
    const own = track(new Tracker({}, { associate: counting })).updates;
    expect(calls).toBeGreaterThan(100);
    expect(own).toEqual(track(new Tracker({})).updates);
  });

  it('an initiator that never pairs starts no track at all', () => {
    const never = { add: () => undefined, take: () => null };
    expect(track(new Tracker({}, { createInitiator: () => never })).updates).toHaveLength(0);
  });

  it('the deleter decides when a track goes', () => {
    // Deleting every established track at its first miss: more deletions, all of them for misses.
    const eager = track(new Tracker({}, { deletionReason: (t) => (t.misses >= 1 ? 'misses' : null) }));
    const normal = track(new Tracker({}));
    const deletions = (r: { out: TrackerOutput[] }) => r.out.flatMap((o) => o.deletions).filter((d) => d.reason !== 'fixed-echo');
    expect(deletions(eager).length).toBeGreaterThan(deletions(normal).length);
    expect(deletions(eager).every((d) => d.reason === 'misses')).toBe(true);
    // No coasting row survives: a track is gone at its first miss.
    expect(eager.updates.some((u) => u.status === 'coasting')).toBe(false);
    expect(normal.updates.some((u) => u.status === 'coasting')).toBe(true);
  });
});
