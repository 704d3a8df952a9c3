import { describe, expect, it } from 'vitest';
import { ReplaySeek, type ReplaySeekOptions } from '../../bridge/server/replay-seek.ts';
import { ComparisonFeed } from '../../bridge/server/comparison-feed.ts';
import { LiveState } from '../../bridge/server/state.ts';
import { ScanBatch } from '../../bridge/server/scan-batch.ts';
import type { LiveComparisonLike } from '../../bridge/server/deps.ts';
import type { SourceRecord } from '../../bridge/ingest/source.ts';
import type { Detection, TrackEngine } from '../../bridge/types.ts';
import { ScriptedSource, trackAt } from '../helpers/scripted-source.ts';

const det = (timeS: number): Detection => ({ timeS, azimuthRad: 0, rangeM: 5, amplitude: 1 });

/** A replay that can hand out its history, as the CSV and session replays do; `hold` delays it. */
class HistorySource extends ScriptedSource {
  hold: Promise<void> = Promise.resolve();
  constructor(private readonly records: SourceRecord[], carriesTracks: boolean) {
    super({ carriesTracks });
  }
  async *recordsUntil(timeS: number): AsyncIterable<SourceRecord> {
    await this.hold;
    for (const r of this.records) if (!('detection' in r) || r.detection.timeS <= timeS + 1) yield r;
  }
}

/** A tracker that answers every detection with one update of track 1, and remembers what it saw. */
function fakeTracker(name: string): TrackEngine & { name: string; seen: number[] } {
  const seen: number[] = [];
  return {
    name, seen,
    push: (d) => (seen.push(d.timeS), { updates: [trackAt(1, d.timeS, d.timeS, 0)], deletions: [] }),
    flush: () => ({ updates: [], deletions: [] }),
    tracks: () => [],
    fixedEchoes: () => [],
  };
}

/** A comparison that logs what it is fed and has one point of history once it saw an update. */
function fakeComparison(log: string[]): LiveComparisonLike {
  let updates = 0;
  return {
    commanded: () => log.push('commanded'),
    positioner: () => log.push('positioner'),
    update: () => (log.push('update'), updates++),
    deletion: () => log.push('deletion'),
    figures: () => [],
    history: () => (updates ? [{ pathId: 'commanded', points: [1, 0.1] }] : []),
    historyAfter: () => [],
    reset: () => log.push('reset'),
    restart: () => log.push('restart'),
  };
}

function setup(source: HistorySource, o: Partial<ReplaySeekOptions> = {}) {
  const steps: string[] = [];
  const state = new LiveState();
  const batch = new ScanBatch({ rateHz: 10, maxDetections: 100, emit: () => steps.push('scan') });
  const comparison = new ComparisonFeed(fakeComparison([]));
  let resolveResync!: () => void;
  const resynced = new Promise<void>((r) => (resolveResync = r));
  const seek = new ReplaySeek({
    state, batch, comparison,
    source: () => source,
    tracking: () => !source.carriesTracks,
    createTracker: () => fakeTracker('fresh'),
    useTracker: (t) => steps.push(`use ${(t as ReturnType<typeof fakeTracker>).name}`),
    createComparison: null,
    handle: (r) => steps.push(`handle ${r.kind}`),
    forgetFixedEchoes: () => steps.push('forget fixed echoes'),
    resync: () => (steps.push('resync'), resolveResync()),
    log: (line) => steps.push(`log ${line}`),
    ...o,
  });
  return { seek, state, batch, comparison, steps, resynced };
}

const turns = async (n: number) => {
  for (let i = 0; i < n; i++) await new Promise((r) => setImmediate(r));
};

describe('ReplaySeek', () => {
  it('a detections CSV: clears at once, re-tracks up to the new time with a fresh tracker, then handles what was queued, then resyncs', async () => {
    const source = new HistorySource([0, 1, 2, 3, 4, 5].map((t) => ({ kind: 'detection', detection: det(t) })), false);
    const tracker = fakeTracker('fresh');
    const { seek, state, batch, steps, resynced } = setup(source, { createTracker: () => tracker });
    state.addUpdate(trackAt(9, 8, 0, 0));
    seek.seeked(3);
    expect(state.tracks()).toEqual([]);
    expect(steps).toEqual(['forget fixed echoes']);
    // What the replay plays meanwhile waits for the rebuild.
    expect(seek.intercept({ kind: 'detection', detection: det(3.1) }, 0)).toBe(true);
    await resynced;
    expect(tracker.seen).toEqual([0, 1, 2, 3]);
    expect(steps).toEqual(['forget fixed echoes', 'use fresh', 'handle detection', 'resync']);
    expect(state.tracks().map((t) => t.timeS)).toEqual([3]);
    expect(state.timeS).toBe(3);
    expect(seek.intercept({ kind: 'detection', detection: det(3.2) }, 0)).toBe(false);
    batch.close();
  });

  it('a session: the comparison is rebuilt from the start and stays stale until then; re-sent records are not queued', async () => {
    const source = new HistorySource([{ kind: 'commanded', path: [] }, { kind: 'track', update: trackAt(1, 0.5, 0, 0) }], true);
    const fed: string[] = [];
    const fresh = fakeComparison(fed);
    const { seek, comparison, steps, resynced, batch } = setup(source, { createComparison: () => fresh });
    seek.seeked(2);
    expect(seek.resending).toBe(true);
    expect(seek.intercept({ kind: 'track', update: trackAt(1, 2, 0, 0) }, 0)).toBe(false);
    expect(comparison.history()).toEqual([]);
    await resynced;
    expect(seek.resending).toBe(false);
    expect(comparison.current).toBe(fresh);
    expect(fed).toEqual(['commanded', 'update']);
    expect(comparison.history()).toEqual([{ pathId: 'commanded', points: [1, 0.1] }]);
    expect(steps).toEqual(['forget fixed echoes', 'resync']);
    batch.close();
  });

  it('an overtaken seek is abandoned: one rebuild, one resync, for the last', async () => {
    const source = new HistorySource([{ kind: 'detection', detection: det(1) }], false);
    let built = 0;
    const { seek, steps, resynced, state, batch } = setup(source, { createTracker: () => (built++, fakeTracker('fresh')) });
    seek.seeked(1);
    seek.seeked(4);
    await resynced;
    await turns(3);
    expect(built).toBe(1);
    expect(steps.filter((s) => s === 'resync')).toHaveLength(1);
    expect(state.timeS).toBe(4);
    batch.close();
  });

  it('a new source during the rebuild abandons it: the queue is dropped and no resync follows', async () => {
    const source = new HistorySource([{ kind: 'detection', detection: det(1) }], false);
    let release!: () => void;
    source.hold = new Promise((r) => (release = r));
    const { seek, steps, batch } = setup(source);
    seek.seeked(2);
    seek.intercept({ kind: 'detection', detection: det(2.1) }, 0);
    await turns(2);
    seek.abandon();
    release();
    await turns(3);
    expect(steps).toEqual(['forget fixed echoes', 'use fresh']);
    expect(seek.intercept({ kind: 'detection', detection: det(2.2) }, 0)).toBe(false);
    batch.close();
  });

  it('a rebuild that fails is logged and the replay goes on: queued records are handled and clients resync', async () => {
    const source = new HistorySource([], false);
    source.recordsUntil = async function* () {
      throw new Error('file gone');
    };
    const { seek, steps, resynced, batch } = setup(source);
    seek.seeked(2);
    seek.intercept({ kind: 'detection', detection: det(2.1) }, 0);
    await resynced;
    expect(steps).toEqual(['forget fixed echoes', 'use fresh', 'log rebuilding state after seek to 2 s: file gone', 'handle detection', 'resync']);
    batch.close();
  });
});
