/**
 * The bridge on real replays (bridge/ingest/replay-source.ts): a recorded session carrying its
 * tracks, and a detections CSV re-tracked by the real tracker, driven over a real WebSocket.
 */
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startBridge, type RunningBridge } from '../../bridge/server/bridge.ts';
import { Recorder } from '../../bridge/session/recorder.ts';
import { benchCsv, resolveBenchRunOptions, trackerOptionsFor } from '../helpers/bench-run.ts';
import { trackAt } from '../helpers/scripted-source.ts';
import { TestClient } from '../helpers/ws-client.ts';
import { createLiveComparison } from '../../bridge/server/deps.ts';
import type { SourceRecord } from '../../bridge/ingest/source.ts';

let bridge: RunningBridge | null = null;
const clients: TestClient[] = [];
let dir = '';
let sessionFile = '';
let sessionId = '';

/** Records `records` (commanded paths at time 0) into a session file of `dir`; returns its path. */
function recordSession(name: string, startUtc: string, records: SourceRecord[]): string {
  const rec = new Recorder({ dir, name, source: { kind: 'simulator', name: 'test' }, startUtc: new Date(startUtc) });
  expect(rec.open()).toBe(true);
  for (const r of records) rec.record(r, r.kind === 'commanded' ? 0 : undefined);
  const file = rec.status().path as string;
  rec.close();
  return file;
}

/** A detection at the same spot and a track update every 0.1 s from 0 to `lastS`, the track at `at(t)`. */
function trackedRun(lastS: number, at: (t: number) => { x: number; y: number }): SourceRecord[] {
  const out: SourceRecord[] = [];
  for (let i = 0; i <= Math.round(lastS * 10); i++) {
    const t = i * 0.1;
    const p = at(t);
    out.push({ kind: 'detection', detection: { timeS: t, azimuthRad: 0.3, rangeM: 2.2, amplitude: 40 } });
    out.push({ kind: 'track', update: trackAt(1, t, p.x, p.y) });
  }
  return out;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'et-replay-'));
  sessionFile = recordSession('circle', '2026-01-01T10:00:00Z', [
    { kind: 'commanded', path: [{ timeS: 0, x: 0, y: 2 }, { timeS: 10, x: 5, y: 2 }] },
    ...trackedRun(10, (t) => ({ x: t * 0.5, y: 2 })),
    { kind: 'deletion', deletion: { timeS: 10, id: 1, reason: 'misses' } },
  ]);
  sessionId = sessionFile.split('/').pop()!.replace('.session.jsonl', '');
});

afterEach(async () => {
  await Promise.all(clients.splice(0).map((c) => c.close()));
  await bridge?.close();
  bridge = null;
});

/** The live comparison's figures after playing `records` through to `timeS`, as a fresh bridge would. */
function figuresPlayedTo(records: readonly SourceRecord[], timeS: number) {
  const through = createLiveComparison(() => undefined);
  for (const r of records) {
    if (r.kind === 'commanded') through.commanded(r.path, r.target);
    if (r.kind === 'track' && r.update.timeS <= timeS) through.update(r.update);
  }
  return through.figures();
}

async function connect(b: RunningBridge): Promise<TestClient> {
  const c = await TestClient.connect(b.wsUrl);
  clients.push(c);
  await c.next('snapshot');
  return c;
}

describe('replay of a recorded session', () => {
  it("a seek while paused re-sends state without counting it as detections per second", async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 5 });
    const snap = await c.next('snapshot', (s) => s.detections.length > 0);
    expect(snap.replay?.playing).toBe(false);
    expect(bridge.pipeline.status().detectionsPerSecond).toBe(0);
  });

  it('a pause sends what was pending before it says paused: no scan follows the paused state', async () => {
    // At 50× the scan batch always holds records when the pause lands; scheduled for the next
    // 30 Hz slot, they went out after "paused" and the picture moved on by a scan.
    for (let round = 0; round < 5; round++) {
      bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, autoplay: true, speed: 50, log: () => undefined });
      const c = await connect(bridge);
      await c.next('scan', (m) => m.timeS > 0.5);
      c.send({ type: 'control', action: 'pause' });
      await c.next('replay', (m) => !m.replay.playing);
      const at = c.messages.length;
      await new Promise((r) => setTimeout(r, 150));
      expect(c.messages.slice(at).filter((m) => m.type === 'scan')).toEqual([]);
      await Promise.all(clients.splice(0).map((x) => x.close()));
      await bridge.close();
      bridge = null;
    }
  });

  it('seeks: a fresh snapshot holds the tracks, history and commanded path at the new time', async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    expect(c.of('snapshot')[0].replay).toMatchObject({ sessionId, durationS: 10, playing: false });
    c.send({ type: 'control', action: 'seek', value: 5 });
    const snap = await c.next('snapshot', (s) => s.tracks.length > 0);
    expect(snap.replay?.positionS).toBe(5);
    expect(snap.tracks[0].id).toBe(1);
    expect(snap.tracks[0].timeS).toBeCloseTo(5, 6);
    expect(snap.commanded).toHaveLength(2);
    const pts = snap.history[0].points;
    expect(pts.length % 3).toBe(0);
    expect(pts[pts.length - 3]).toBeCloseTo(5, 6);
    // The filter's speed and heading ride along, one pair per point, as live updates carry them.
    const kin = snap.history[0].kinematics!;
    expect(kin.length).toBe((pts.length / 3) * 2);
    expect(kin[kin.length - 2]).toBeCloseTo(snap.tracks[0].speed, 9);
    expect(kin[kin.length - 1]).toBeCloseTo(snap.tracks[0].headingRad, 9);
    // The re-sent state is in the snapshot, not streamed again as increments.
    expect(c.of('scan').flatMap((s) => s.updates)).toEqual([]);
  });

  it('after a seek back, scans carry the replay clock again, not the highest time seen', async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 8 });
    await c.next('snapshot', (s) => s.replay?.positionS === 8);
    c.send({ type: 'control', action: 'step', value: 0.5 });
    await c.next('scan', (s) => s.timeS >= 8.4);
    c.send({ type: 'control', action: 'seek', value: 2 });
    const snap = await c.next('snapshot', (s) => s.replay?.positionS === 2);
    expect(snap.timeS).toBeCloseTo(2, 6);
    const from = c.messages.length;
    c.send({ type: 'control', action: 'step', value: 0.5 });
    const scan = await c.next('scan', (s) => s.updates.length > 0, from);
    expect(scan.timeS).toBeGreaterThan(2);
    expect(scan.timeS).toBeLessThanOrEqual(2.5 + 1e-9);
  });

  it('steps back over the WebSocket: exactly one step earlier, paused, the figures rebuilt; never before 0', async () => {
    // 10 s along x = 0.5·t, y = 2: the track is 0.2 m off the line for its first 5 s, on it after.
    const records: SourceRecord[] = [
      { kind: 'commanded', path: [{ timeS: 0, x: 0, y: 2 }, { timeS: 10, x: 5, y: 2 }] },
      ...trackedRun(10, (t) => ({ x: 0.5 * t, y: t < 5 ? 2.2 : 2 })),
    ];
    const file = recordSession('steps', '2026-01-01T13:00:00Z', records);
    bridge = await startBridge({ port: 0, replay: file, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 6 });
    await c.next('snapshot', (s) => s.replay?.positionS === 6);
    // No antenna samples in this run: the default step is 0.5 s, forward and back alike.
    c.send({ type: 'control', action: 'step' });
    c.send({ type: 'control', action: 'step' });
    await c.next('replay', (m) => m.replay.positionS === 7);
    let from = c.messages.length;
    c.send({ type: 'control', action: 'step-back' });
    const snap = await c.next('snapshot', (s) => s.replay?.positionS === 6.5, from);
    expect(snap.replay?.playing).toBe(false);
    expect(snap.tracks[0].timeS).toBeCloseTo(6.5, 6);
    // The figures are those of the run played through to 6.5 s, as after any seek.
    const [expected] = figuresPlayedTo(records, 6.5);
    expect(expected.rmseM).toBeGreaterThan(0.1);
    expect(snap.comparisonHistory?.[0].points.at(-1)).toBeCloseTo(expected.rmseM!, 9);
    const m = await c.next('comparison', (x) => x.figures.samples > 0, c.messages.indexOf(snap));
    expect(m.figures.samples).toBe(expected.samples);
    expect(m.figures.rmseM).toBeCloseTo(expected.rmseM!, 9);

    // Near the start it stops at 0, and at 0 it stays there.
    c.send({ type: 'control', action: 'seek', value: 0.2 });
    await c.next('snapshot', (s) => s.replay?.positionS === 0.2);
    c.send({ type: 'control', action: 'step-back' });
    await c.next('snapshot', (s) => s.replay?.positionS === 0);
    from = c.messages.length;
    c.send({ type: 'control', action: 'step-back' });
    const at0 = await c.next('replay', () => true, from);
    expect(at0.replay).toMatchObject({ positionS: 0, playing: false });
    // A length, when given, is checked as the forward step's is.
    c.send({ type: 'control', action: 'step-back', value: -1 });
    expect((await c.next('error', () => true, from)).message).toMatch(/'step-back' value -1/);
  });

  it('plays from the seek position: updates after it arrive in time order, then the deletion', async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 8 });
    await c.next('snapshot', (s) => s.replay?.positionS === 8);
    c.send({ type: 'control', action: 'speed', value: 50 });
    c.send({ type: 'control', action: 'play' });
    await c.next('scan', (s) => s.deletions.length > 0);
    const times = c.of('scan').flatMap((s) => s.updates.map((u) => u.timeS));
    expect(times.length).toBeGreaterThan(10);
    expect(times[0]).toBeGreaterThan(8);
    expect(times).toEqual([...times].sort((a, b) => a - b));
  });

  it('compares the followed track with the commanded path live (comparison messages)', async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, speed: 50, log: () => undefined });
    const c = await connect(bridge);
    const m = await c.next('comparison', (x) => x.figures.samples > 20);
    // The recorded track runs exactly along the commanded line x = 0.5·t, y = 2.
    expect(m.figures.trackId).toBe(1);
    expect(m.figures.rmseM).toBeLessThan(1e-6);
    expect(Math.abs(m.figures.crossTrackM ?? 1)).toBeLessThan(1e-6);
  });

  it('after a seek, the running figures cover the run from its start, not only the re-sent window', async () => {
    // 30 s along x = 0.2·t, y = 2: the track is 0.2 m off the line for its first 10 s, on it after.
    const records: SourceRecord[] = [
      { kind: 'commanded', path: [{ timeS: 0, x: 0, y: 2 }, { timeS: 30, x: 6, y: 2 }] },
      ...trackedRun(30, (t) => ({ x: 0.2 * t, y: t < 10 ? 2.2 : 2 })),
    ];
    const file = recordSession('offset', '2026-01-01T12:30:00Z', records);
    // What playing the run through to 25 s gives: the whole run's figures, the offset included.
    const [expected] = figuresPlayedTo(records, 25);
    expect(expected.rmseM).toBeGreaterThan(0.1);

    bridge = await startBridge({ port: 0, replay: file, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 25 });
    const snap = await c.next('snapshot', (x) => x.replay?.positionS === 25);
    // The snapshot carries the running RMSE since the start, for the dashboard's chart.
    const h = snap.comparisonHistory?.[0];
    expect(h?.pathId).toBe('commanded');
    expect(h!.points[0]).toBeLessThan(0.5);
    expect(h!.points.at(-1)).toBeCloseTo(expected.rmseM!, 9);
    const m = await c.next('comparison', (x) => x.figures.samples > 0);
    // The re-sent window (the last 10 s) alone would give 100 samples and an RMSE of 0.
    expect(m.figures.samples).toBe(expected.samples);
    expect(m.figures.rmseM).toBeCloseTo(expected.rmseM!, 9);
    expect(m.figures.maxErrorM).toBeCloseTo(0.2, 9);
  });

  it('comparison messages carry every running-RMSE point since the last, however fast the replay plays', async () => {
    bridge = await startBridge({ port: 0, replay: sessionFile, sessionsDir: dir, speed: 50, log: () => undefined });
    const c = await connect(bridge);
    await c.next('replay', (m) => m.replay.positionS >= 10 || !m.replay.playing);
    await c.next('comparison', (m) => m.figures.timeS >= 9.5);
    const points = c.of('comparison').flatMap((m) => {
      const r = m.recent ?? [];
      return r.filter((_, i) => i % 2 === 0);
    });
    // 10 s of run in 0.2 s of wall time: a point every 0.25 s of run all the same, from near the start.
    expect(points[0]).toBeLessThan(1);
    for (let i = 1; i < points.length; i++) expect(points[i] - points[i - 1]).toBeLessThan(0.5);
    expect(points.at(-1)).toBeGreaterThan(9);
  });

  it('a seek back rebuilds the paths of named positioners up to the new time, in time order', async () => {
    const records: SourceRecord[] = [];
    for (let i = 0; i <= 300; i++) {
      const t = i * 0.1;
      records.push({ kind: 'positioner', sample: { timeS: t, cmdX: -1.5 + 0.1 * t, cmdY: 2.4, target: '1' } });
      records.push({ kind: 'positioner', sample: { timeS: t, cmdX: 1.5 - 0.1 * t, cmdY: 3.6, target: '2' } });
      records.push({ kind: 'track', update: trackAt(1, t, -1.5 + 0.1 * t, 2.45) });
    }
    const file = recordSession('two-positioners', '2026-01-01T13:00:00Z', records);
    bridge = await startBridge({ port: 0, replay: file, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 25 });
    await c.next('snapshot', (x) => x.replay?.positionS === 25);
    c.send({ type: 'control', action: 'seek', value: 10 });
    const snap = await c.next('snapshot', (x) => x.replay?.positionS === 10);
    expect(snap.commandedFrom).toBe('positioner');
    expect(snap.commandedPaths?.map((p) => p.target)).toEqual(['1', '2']);
    for (const p of snap.commandedPaths ?? []) {
      const times = p.path.map((q) => q.timeS);
      expect(times[0]).toBe(0);
      expect(times.at(-1)).toBeCloseTo(10, 6);
      for (let i = 1; i < times.length; i++) expect(times[i]).toBeGreaterThan(times[i - 1]);
    }
  });

  it('a list of sessions (the demo) keeps the speed chosen on the dashboard when it moves on, and says where it is', async () => {
    const short = recordSession('short', '2026-01-01T11:00:00Z', Array.from({ length: 31 }, (_, i): SourceRecord => ({ kind: 'track', update: trackAt(1, i * 0.1, 0, 2) })));
    bridge = await startBridge({ port: 0, playlist: [short, sessionFile], loop: true, sessionsDir: dir, autoplay: true, speed: 1, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'speed', value: 2 });
    const first = await c.next('replay', (m) => m.replay.speed === 2);
    expect(first.replay.playlist).toEqual({ index: 0, count: 2, loops: true });
    const next = await c.next('snapshot', (m) => m.replay?.sessionId === sessionId);
    expect(next.replay?.speed).toBe(2);
    expect(next.replay?.playlist).toEqual({ index: 1, count: 2, loops: true });
  });

  it('a run with two commanded paths (two carriages): both reach the dashboard, each compared with its own track', async () => {
    const records: SourceRecord[] = [
      { kind: 'commanded', target: '1', path: [{ timeS: 0, x: -1.5, y: 2.4 }, { timeS: 10, x: 1.5, y: 3.6 }] },
      { kind: 'commanded', target: '2', path: [{ timeS: 0, x: 1.5, y: 2.4 }, { timeS: 10, x: -1.5, y: 3.6 }] },
    ];
    for (let i = 0; i <= 100; i++) {
      const t = i * 0.1, f = t / 10;
      records.push({ kind: 'track', update: trackAt(1, t, -1.5 + 3 * f, 2.4 + 1.2 * f) }, { kind: 'track', update: trackAt(2, t, 1.5 - 3 * f + 0.05, 2.4 + 1.2 * f) });
    }
    const file = recordSession('two-carriages', '2026-01-01T12:00:00Z', records);
    bridge = await startBridge({ port: 0, replay: file, sessionsDir: dir, autoplay: false, log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 5 });
    const snap = await c.next('snapshot', (s) => s.replay?.positionS === 5);
    expect(snap.commandedPaths?.map((p) => p.target)).toEqual(['1', '2']);
    c.send({ type: 'control', action: 'speed', value: 50 });
    c.send({ type: 'control', action: 'play' });
    const two = await c.next('comparison', (m) => m.figures.pathId === '2' && m.figures.samples > 5);
    expect(two.figures.trackId).toBe(2);
    expect(two.figures.rmseM).toBeLessThan(0.1);
    const one = await c.next('comparison', (m) => m.figures.pathId === '1' && m.figures.samples > 5);
    expect(one.figures.trackId).toBe(1);
  });

  it('lists sessions and opens one by id over the WebSocket; refuses unknown ids', async () => {
    bridge = await startBridge({ port: 0, sessionsDir: dir, log: () => undefined });
    const c = await connect(bridge);
    expect(c.of('snapshot')[0].source.kind).toBe('none');
    c.send({ type: 'list-sessions' });
    const list = await c.next('sessions');
    expect(list.sessions.map((s) => s.id)).toContain(sessionId);
    c.send({ type: 'open-session', sessionId: '../../etc/passwd' });
    expect((await c.next('error')).code).toBe('E_PATH');
    c.send({ type: 'open-session', sessionId });
    const snap = await c.next('snapshot', (s) => s.replay?.sessionId === sessionId);
    expect(snap.source.kind).toBe('replay');
  });
});

describe('replay of a detections CSV', () => {
  it('tracks it with the real tracker, and after a seek re-tracks up to the new time', async () => {
    const run = resolveBenchRunOptions({ durationS: 20 });
    const csv = join(dir, 'circle.csv');
    writeFileSync(csv, benchCsv(run));
    bridge = await startBridge({ port: 0, replay: csv, sessionsDir: dir, autoplay: false, trackerOptions: trackerOptionsFor(run), log: () => undefined });
    const c = await connect(bridge);
    c.send({ type: 'control', action: 'seek', value: 12 });
    const snap = await c.next('snapshot', (s) => s.replay?.positionS === 12);
    const moving = snap.tracks.filter((t) => t.moving && t.status === 'confirmed');
    expect(moving).toHaveLength(1);
    // The reflector at 12 s: angle v·t/r on the circle around (0, 3).
    const a = (0.5 * 12) / 1;
    expect(Math.hypot(moving[0].x - Math.sin(a), moving[0].y - (3 + Math.cos(a)))).toBeLessThan(0.15);
    expect(snap.detections.length).toBeGreaterThan(0);
    expect(Math.max(...snap.detections.map((d) => d.timeS))).toBeLessThanOrEqual(12);
    c.send({ type: 'control', action: 'speed', value: 20 });
    c.send({ type: 'control', action: 'play' });
    const scan = await c.next('scan', (s) => s.updates.some((u) => u.id === moving[0].id));
    // Play carries on from the rebuilt track: its next update is newer than the snapshot's.
    const next = scan.updates.find((u) => u.id === moving[0].id)!;
    expect(next.timeS).toBeGreaterThan(moving[0].timeS);
    expect(next.timeS).toBeLessThan(12 + 1);
  });
});
