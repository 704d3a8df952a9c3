/**
 * The tracker's swappable parts: the filter each track runs, the gate, the associator, the
 * initiator and the deleter. Tracker composes them and holds none of their logic; each lives in
 * its own module with its own test. The defaults are echotrail's own; a test or an experiment can
 * pass another part (a greedy associator, a stricter deleter) to the Tracker without touching it:
 *
 *   new Tracker({}, { associate: greedyAssign });
 */
import type { Detection, Measurement } from '../types.ts';
import { assign } from './assignment.ts';
import { createFilter, type FilterOptions } from './filter.ts';
import type { TrackFilter } from './filter-types.ts';
import { gateBatch } from './gating.ts';
import { SeedPool, type Seed } from './seeds.ts';
import type { DeletionOptions, Track } from './track-life.ts';

/** What the tracker needs of an initiator: it keeps detections no track took, and pairs them. */
export interface Initiator {
  /** Keeps a detection that no track took and that paired with no earlier one. */
  add(m: Measurement, d: Detection): void;
  /** The kept detection this one continues (the new track's first hit), removed from the pool; or null. */
  take(m: Measurement): Seed | null;
}

export interface TrackerParts {
  /**
   * A new track's filter from its first measurement (filter.ts): `sigmaVel0` is the initial
   * velocity standard deviation per axis, m/s; `intervalS` the expected time between detections.
   */
  createFilter: (m: Measurement, o: FilterOptions, sigmaVel0: number, intervalS: number) => TrackFilter;
  /** Gates a batch of measurements against the indexed tracks and the fixed-echo map (gating.ts). */
  gate: typeof gateBatch;
  /** Picks the pairs of one assignment pass given each track's miss cost (assignment.ts: global nearest neighbour). */
  associate: typeof assign;
  /**
   * The initiator (seeds.ts: two-point initiation): pairs within `maxSpeedMps`·Δt plus noise, no
   * later than `lifeS` and no sooner than `minGapS` after the first detection.
   */
  createInitiator: (maxSpeedMps: number, lifeS: number, minGapS: number) => Initiator;
  /** Why an established track goes now ('misses', 'covariance'), or null to keep it (track-life.ts). */
  deletionReason: (t: Track, nowS: number, o: DeletionOptions) => 'misses' | 'covariance' | null;
}

/** The parts given, the defaults for the rest. */
export function resolveTrackerParts(p: Partial<TrackerParts> = {}): TrackerParts {
  return {
    createFilter: p.createFilter ?? createFilter,
    gate: p.gate ?? gateBatch,
    associate: p.associate ?? assign,
    createInitiator: p.createInitiator ?? ((maxSpeedMps, lifeS, minGapS) => new SeedPool(maxSpeedMps, lifeS, minGapS)),
    deletionReason: p.deletionReason ?? ((t, nowS, o) => t.deletionReason(nowS, o)),
  };
}
