import { afterEach, describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startBridge, type RunningBridge } from '../../bridge/server/bridge.ts';
import { ScriptedSource, trackAt } from '../helpers/scripted-source.ts';
import { TestClient } from '../helpers/ws-client.ts';
import { hasCode } from '../../bridge/errors.ts';

const quiet = (): void => undefined;
let bridge: RunningBridge | null = null;
const clients: TestClient[] = [];

async function start(source: ScriptedSource, extra: Parameters<typeof startBridge>[0] = {}): Promise<RunningBridge> {
  bridge = await startBridge({ port: 0, sessionsDir: mkdtempSync(join(tmpdir(), 'et-sessions-')), createSource: () => source, log: quiet, ...extra });
  return bridge;
}

async function connect(url: string): Promise<TestClient> {
  const c = await TestClient.connect(url);
  clients.push(c);
  return c;
}

afterEach(async () => {
  await Promise.all(clients.splice(0).map((c) => c.close()));
  await bridge?.close();
  bridge = null;
});

describe('startBridge', () => {
  it('greets with hello then a snapshot holding the current tracks', async () => {
    const src = new ScriptedSource();
    const b = await start(src);
    src.emitRecord({ kind: 'track', update: trackAt(7, 1.0, 1, 2) });
    src.emitRecord({ kind: 'commanded', path: [{ timeS: 0, x: 0, y: 1 }, { timeS: 1, x: 1, y: 1 }] });
    const c = await connect(b.wsUrl);
    const snap = await c.next('snapshot');
    expect(c.messages[0]).toMatchObject({ type: 'hello', protocol: 1 });
    expect(snap.tracks.map((t) => t.id)).toEqual([7]);
    expect(snap.history).toEqual([{ id: 7, points: [1.0, 1, 2], kinematics: [0.5, Math.PI / 2] }]);
    expect(snap.commanded).toHaveLength(2);
    expect(snap.replay).toMatchObject({ sessionId: 'scripted' });
    expect(c.invalid).toEqual([]);
  });

  it('streams increments as scan messages with increasing seq, deletions included', async () => {
    const src = new ScriptedSource();
    const b = await start(src);
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    for (let i = 0; i < 20; i++) src.emitRecord({ kind: 'track', update: trackAt(1, i * 0.1, i * 0.05, 2) });
    src.emitRecord({ kind: 'deletion', deletion: { timeS: 2.0, id: 1, reason: 'misses' } });
    src.emitRecord({ kind: 'antenna', sample: { timeS: 2.0, azimuthRad: 1.5 } });
    await c.next('scan', (s) => s.deletions.some((d) => d.id === 1));
    const scans = c.of('scan');
    const updates = scans.flatMap((s) => s.updates);
    // Every update arrives once, in order, even though scans were merged.
    expect(updates.map((u) => u.timeS)).toEqual(Array.from({ length: 20 }, (_, i) => i * 0.1));
    const seqs = scans.map((s) => s.seq as number);
    expect(seqs).toEqual(seqs.map((_, i) => seqs[0] + i));
    expect(scans.at(-1)?.antennaAzimuthRad).toBe(1.5);
    // Merging means fewer scans than records.
    expect(scans.length).toBeLessThan(22);
    const c2 = await connect(b.wsUrl);
    expect((await c2.next('snapshot')).tracks).toEqual([]);
  });

  it('a client connecting mid-stream gets every detection once: snapshot, then scans', async () => {
    const src = new ScriptedSource();
    // A slow scan rate keeps detections waiting in the batch whenever the snapshot is taken.
    const b = await start(src, { scanRateHz: 4 });
    let t = 0;
    const det = (timeS: number) => ({ kind: 'detection' as const, detection: { timeS, azimuthRad: 0.5, rangeM: 3, amplitude: 10 } });
    const feeder = setInterval(() => src.emitRecord(det((t += 0.01))), 2);
    // Mid-stream: a few scans have left before the client comes.
    await new Promise<void>((resolve) => {
      const wait = setInterval(() => t > 0.5 && (clearInterval(wait), resolve()), 5);
    });
    const c = await connect(b.wsUrl);
    const snap = await c.next('snapshot');
    await c.next('scan', (s) => s.detections.length > 0);
    await c.next('scan', (s) => s.detections.length > 0, c.messages.length);
    clearInterval(feeder);
    src.emitRecord(det(999));
    await c.next('scan', (s) => s.detections.some((d) => d.timeS === 999));
    const times = [...snap.detections, ...c.of('scan').flatMap((s) => s.detections)].map((d) => d.timeS);
    expect(snap.detections.length).toBeGreaterThan(0);
    expect(times.length - new Set(times).size).toBe(0);
    // Nothing lost either: from the snapshot's first detection on, every one emitted arrived.
    const first = Math.round(Math.min(...times) * 100);
    expect(new Set(times).size).toBe(Math.round(t * 100) - first + 2);
  });

  it('passes replay controls to the source and answers with the replay state', async () => {
    const src = new ScriptedSource();
    const b = await start(src);
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    c.send({ type: 'control', action: 'speed', value: 4 });
    await c.next('replay', (m) => m.replay.speed === 4);
    c.send({ type: 'control', action: 'play' });
    await c.next('replay', (m) => m.replay.playing);
    c.send({ type: 'control', action: 'seek', value: 30 });
    // A seek rebuilds the state: a second snapshot follows, at the new position.
    const resent = await c.next('snapshot', () => true, c.messages.findIndex((m) => m.type === 'snapshot') + 1);
    expect(resent.replay?.positionS).toBe(30);
    c.send({ type: 'control', action: 'speed', value: 500 });
    const err = await c.next('error');
    expect(err.message).toMatch(/speed/);
    expect(src.calls).toEqual(['speed 4', 'play', 'seek 30']);
  });

  it('reports bad lines and source state in source messages', async () => {
    const src = new ScriptedSource({ kind: 'serial', name: '/dev/ttyX' });
    const b = await start(src, { record: false });
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    src.emitBad({ line: 12, reason: 'checksum mismatch', text: 'det 1 2 3 4|FFFF' });
    src.emitBad({ line: 13, reason: 'empty line', text: '' });
    const m = await c.next('source', (s) => s.source.badLines === 2);
    expect(m.source.lastBad).toEqual({ line: 13, reason: 'empty line' });
    src.setState('waiting', 'port gone');
    expect((await c.next('source', (s) => s.source.state === 'waiting')).source.kind).toBe('serial');
  });

  it('serves /api/health and /api/sessions as JSON', async () => {
    const b = await start(new ScriptedSource());
    const health = await (await fetch(new URL('/api/health', b.url))).json();
    expect(health).toMatchObject({ ok: true, protocol: 1, clients: 0 });
    const res = await fetch(new URL('/api/sessions', b.url));
    expect(res.status).toBe(200);
    expect(Array.isArray((await res.json()).sessions)).toBe(true);
    expect((await fetch(new URL('/api/nothing', b.url))).status).toBe(404);
  });

  it('serves POST /api/calibrate; bad bodies get 400, GET gets 405', async () => {
    const b = await start(new ScriptedSource());
    const post = (body: string) => fetch(new URL('/api/calibrate', b.url), { method: 'POST', body, headers: { 'content-type': 'application/json' } });
    const steps = await post(JSON.stringify({ action: 'steps' }));
    expect(steps.status).toBe(200);
    expect((await steps.json()).ok).toBe(true);
    const bad = await post('{"action": ');
    expect(bad.status).toBe(400);
    expect((await fetch(new URL('/api/calibrate', b.url))).status).toBe(405);
    // Another site's page posting to the loopback port is refused before any work is done.
    const foreign = await fetch(new URL('/api/calibrate', b.url), { method: 'POST', body: JSON.stringify({ action: 'steps' }), headers: { 'content-type': 'application/json', origin: 'http://elsewhere.example' } });
    expect(foreign.status).toBe(403);
  });

  it('keeps the live view running when recording fails, and says why', async () => {
    const notAFolder = join(mkdtempSync(join(tmpdir(), 'et-rec-')), 'file');
    writeFileSync(notAFolder, 'x');
    const src = new ScriptedSource({ kind: 'serial', name: '/dev/ttyQ' });
    const b = await start(src, { record: true, sessionsDir: notAFolder });
    const c = await connect(b.wsUrl);
    const snap = await c.next('snapshot');
    expect(snap.source.recording).toBeNull();
    expect(snap.source.recordingError).toMatch(/not a folder|cannot|failed/);
    src.emitRecord({ kind: 'track', update: trackAt(9, 1, 1, 1) });
    expect((await c.next('scan', (m) => m.updates.length > 0)).updates[0].id).toBe(9);
  });

  it('answers an unreadable session with an error and stays usable', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'et-bad-'));
    writeFileSync(join(dir, 'broken.session.jsonl'), 'this is not a session\n');
    const b = await start(new ScriptedSource(), { sessionsDir: dir });
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    c.send({ type: 'open-session', sessionId: 'broken' });
    const err = await c.next('error');
    expect(err.code).toBe('E_SESSION_FORMAT');
    const snap = await c.next('snapshot', (m) => m.source.kind === 'none');
    expect(snap.tracks).toEqual([]);
    c.send({ type: 'list-sessions' });
    expect(Array.isArray((await c.next('sessions')).sessions)).toBe(true);
  });
});

describe('source switches', () => {
  it('runs overlapping switches one after the other: only the last source stays attached', async () => {
    const first = new ScriptedSource({ name: 'first' });
    const b = await start(first);
    const a = new ScriptedSource({ name: 'a' });
    const z = new ScriptedSource({ name: 'z' });
    await Promise.all([b.setSource(a), b.setSource(z)]);
    expect([first.closed, a.closed, z.closed]).toEqual([true, true, false]);
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    a.emitRecord({ kind: 'track', update: trackAt(1, 1, 0, 0) });
    z.emitRecord({ kind: 'track', update: trackAt(2, 1, 0, 0) });
    const scan = await c.next('scan');
    expect(scan.updates.map((u) => u.id)).toEqual([2]);
    expect(b.pipeline.status().name).toBe('z');
  });
});

describe('tracker options', () => {
  it('refuses bad tracker options at start with the tracker\'s own E_OPTION message', async () => {
    const err = await startBridge({ port: 0, createSource: () => new ScriptedSource({ carriesTracks: false }), trackerOptions: { antenna: 'sideways' }, log: quiet }).catch((e: unknown) => e);
    expect(hasCode(err, 'E_OPTION')).toBe(true);
    expect((err as Error).message).toMatch(/antenna/);
  });
});

describe('positioner frame', () => {
  const calibration = { version: 1, bench: 't', updatedUtc: '2026-12-02T00:00:00.000Z', radar: { rangeOffsetM: 0, rangeScale: 1, azimuthOffsetDeg: 0 }, positionerFrame: { rotationDeg: 90, translationM: { x: 1, y: 0 } }, history: [] };

  it('maps live positioner samples into the radar frame with the calibration (p = R·p + t, R counter-clockwise)', async () => {
    const src = new ScriptedSource({ kind: 'serial', name: '/dev/ttyP' });
    const b = await start(src, { record: false, calibration });
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    src.emitRecord({ kind: 'positioner', sample: { timeS: 1, cmdX: 1, cmdY: 0, measX: 0, measY: 2 } });
    const p = (await c.next('scan', (s) => s.positioner.length > 0)).positioner[0];
    expect(p.cmdX).toBeCloseTo(1, 12);
    expect(p.cmdY).toBeCloseTo(1, 12);
    expect(p.measX).toBeCloseTo(-1, 12);
    expect(p.measY).toBeCloseTo(0, 12);
  });

  it('leaves replayed samples alone: sessions already hold the radar frame', async () => {
    const src = new ScriptedSource({ kind: 'replay' });
    const b = await start(src, { calibration });
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    src.emitRecord({ kind: 'positioner', sample: { timeS: 1, cmdX: 1, cmdY: 0 } });
    expect((await c.next('scan', (s) => s.positioner.length > 0)).positioner[0]).toEqual({ timeS: 1, cmdX: 1, cmdY: 0 });
  });
});
