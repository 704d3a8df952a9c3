/**
 * Seek index on a one-hour synthetic session: snapshots and record ranges read through the index
 * equal the brute-force answer computed from the records as written.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openSession, type SessionReader } from '../../bridge/session/reader.ts';
import type { TrackUpdate } from '../../bridge/types.ts';
import { writeSyntheticSession, type SyntheticSession } from './synthetic-session.ts';

const HISTORY_S = 10;
const RECENT_S = 1;

/** The definition of a snapshot, applied to every record from the start. */
function bruteSnapshot(written: SyntheticSession['written'], t: number) {
  const tracks = new Map<number, TrackUpdate>();
  const history = new Map<number, number[]>();
  let detections = 0;
  let fixedSeen: number | null = null;
  for (const { timeS, record } of written) {
    if (timeS > t) break;
    if (record.kind === 'track') {
      tracks.set(record.update.id, record.update);
      if (timeS >= t - HISTORY_S) history.set(record.update.id, [...(history.get(record.update.id) ?? []), timeS]);
    } else if (record.kind === 'deletion') {
      tracks.delete(record.deletion.id);
      history.delete(record.deletion.id);
    } else if (record.kind === 'detection' && timeS >= t - RECENT_S) detections++;
    else if (record.kind === 'fixed-echoes') fixedSeen = record.echoes[0].seen;
  }
  return { tracks: [...tracks.values()].sort((a, b) => a.id - b.id), history, detections, fixedSeen };
}

describe('seek index on a one-hour session', () => {
  let dir: string;
  let syn: SyntheticSession;
  let s: SessionReader;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'echotrail-seek-'));
    syn = writeSyntheticSession(dir, 3600);
    s = await openSession(syn.path, { historyS: HISTORY_S, recentDetectionsS: RECENT_S });
  });
  afterAll(() => {
    s?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('indexes about one checkpoint per second and reads every line', () => {
    expect(s.badLineCount).toBe(0);
    expect(s.truncatedTail).toBeNull();
    expect(s.durationS).toBeCloseTo(3600, 6);
    expect(s.index.checkpoints.length).toBe(3601);
    expect(s.detections).toBe(syn.written.filter((w) => w.record.kind === 'detection').length);
  });

  const times = [0, 0.05, 12.3, 599.95, 1234.5, 1800, 2999.99, 3599.9, 3600, 5000];
  for (const t of times) {
    it(`snapshotAt(${t}) equals the brute-force snapshot`, () => {
      const want = bruteSnapshot(syn.written, Math.min(t, 3600));
      const got = s.snapshotAt(t);
      expect(got.timeS).toBe(Math.min(t, 3600));
      expect(got.tracks).toEqual(want.tracks);
      expect(got.detections.length).toBe(want.detections);
      expect(got.fixedEchoes[0]?.seen ?? null).toBe(want.fixedSeen);
      expect(got.commanded.length).toBe(2);
      for (const h of got.history) {
        const wantTimes = want.history.get(h.id) ?? [];
        expect(h.points.filter((_, i) => i % 3 === 0)).toEqual(wantTimes);
      }
      expect(got.history.length).toBe([...want.history.keys()].filter((id) => want.tracks.some((tr) => tr.id === id)).length);
    });
  }

  it('the session has stale-but-alive tracks, so the test covers them', () => {
    const snap = s.snapshotAt(3000);
    expect(snap.tracks.some((tr) => tr.timeS < 2900)).toBe(true);
  });

  it('records(from, to) returns exactly the records written in that interval', () => {
    const from = 1799.95;
    const to = 1802.05;
    const got = [...s.records(from, to)].map((r) => [r.timeS, r.record.kind]);
    const want = syn.written.filter((w) => w.timeS >= from && w.timeS <= to).map((w) => [w.timeS, w.record.kind]);
    expect(got).toEqual(want);
    expect(got.length).toBeGreaterThan(50);
  });
});
