/**
 * End to end over a real pseudo-terminal: protocol lines written at the hardware end of a socat
 * pair come out of the bridge as track updates at a real WebSocket client; bad lines among them
 * are counted and shown, the good ones around them still arrive; killing and restarting socat is
 * survived without a restart; a device whose clock restarts begins a new run; each live run is
 * recorded to its own session file.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startBridge, type RunningBridge } from '../../bridge/server/bridge.ts';
import { listSessions } from '../../bridge/session/list.ts';
import { benchLines, resolveBenchRunOptions, trackerOptionsFor } from '../helpers/bench-run.ts';
import { PtyPair, socatAvailable } from '../helpers/socat.ts';
import { TestClient } from '../helpers/ws-client.ts';

const haveSocat = socatAvailable();
/**
 * Length of the restarted run, s: long enough for a track to be reported as moving, which the
 * tracker allows only once the track is older than the fixed-echo map's settling time (2 s at
 * least, bridge/tracking/fixed-echo-map.ts), so that a wall reflector is never shown as a target.
 */
const RESTART_S = 5;

describe.skipIf(!haveSocat)('serial → WebSocket through a socat pty pair', () => {
  const dir = mkdtempSync(join(tmpdir(), 'et-serial-'));
  const sessionsDir = join(dir, 'sessions');
  const run = resolveBenchRunOptions({ durationS: 8 });
  const lines = [...benchLines(run)];
  const firstHalf = lines.filter((l) => l.timeS < 4);
  const secondHalf = lines.filter((l) => l.timeS >= 4);
  const pty = new PtyPair(dir);
  let bridge: RunningBridge;
  let client: TestClient;

  beforeAll(async () => {
    await pty.start();
    bridge = await startBridge({
      port: 0,
      sessionsDir,
      serial: { path: pty.device, baudRate: 115200, reopenInitialMs: 100, reopenMaxMs: 400 },
      trackerOptions: trackerOptionsFor(run),
      log: () => undefined,
    });
    client = await TestClient.connect(bridge.wsUrl);
    await client.next('source', (m) => m.source.state === 'live');
  });

  afterAll(async () => {
    await client?.close();
    await bridge?.close();
    await pty.stop();
  });

  it('turns lines into track updates; bad lines are counted and the good ones around them kept', async () => {
    const bad = ['det 1.0 10 2 5|0000\n', 'complete garbage \x01\x02\n', 'x'.repeat(5000) + '\n'];
    firstHalf.forEach((l, i) => {
      pty.write(l.line);
      if (i % 50 === 25 && bad.length) pty.write(bad.shift()!);
    });
    const lastDet = firstHalf.filter((l) => l.record.kind === 'detection').at(-1)!.timeS;
    await client.next('scan', (s) => s.detections.some((d) => d.timeS >= lastDet - 1e-6));
    const detections = client.of('scan').flatMap((s) => s.detections);
    expect(detections).toHaveLength(firstHalf.filter((l) => l.record.kind === 'detection').length);
    const updates = client.of('scan').flatMap((s) => s.updates);
    const moving = updates.filter((u) => u.status === 'confirmed' && u.moving);
    expect(moving.length).toBeGreaterThan(5);
    const positioner = client.of('scan').flatMap((s) => s.positioner);
    expect(positioner.length).toBe(firstHalf.filter((l) => l.record.kind === 'positioner').length);
    const status = await client.next('source', (m) => m.source.badLines === 3);
    expect(status.source.lastBad?.reason).toMatch(/newline|longer/);
    expect(status.source.recording).toMatch(/\.session\.jsonl$/);
  });

  it('reports the port gone when socat dies, and streams again when it returns', async () => {
    const before = client.messages.length;
    await pty.stop();
    await client.next('source', (m) => m.source.state === 'waiting', before);
    await pty.start();
    const back = client.messages.length;
    await client.next('source', (m) => m.source.state === 'live', back);
    for (const l of secondHalf) pty.write(l.line);
    const lastT = secondHalf.filter((l) => l.record.kind === 'detection').at(-1)!.timeS;
    await client.next('scan', (s) => s.detections.some((d) => d.timeS >= lastT - 1e-6), back);
    const after = client.messages.slice(back).flatMap((m) => (m.type === 'scan' ? m.updates : []));
    expect(after.some((u) => u.timeS > 4 && u.status === 'confirmed')).toBe(true);
  });

  it('starts a new run (fresh tracks, new session file) when the device restarts its clock', async () => {
    const firstRecording = client.of('source').at(-1)!.source.recording;
    const from = client.messages.length;
    const restart = lines.filter((l) => l.timeS < RESTART_S);
    for (const l of restart) pty.write(l.line);
    const snap = await client.next('snapshot', () => true, from);
    expect(snap.tracks).toEqual([]);
    const lastT = restart.filter((l) => l.record.kind === 'detection').at(-1)!.timeS;
    await client.next('scan', (s) => s.detections.some((d) => d.timeS >= lastT - 1e-6), from);
    const status = await client.next('source', (m) => m.source.recording !== null && m.source.recording !== firstRecording, from);
    expect(status.source.recording).toMatch(/\.session\.jsonl$/);
    const updates = client.messages.slice(from).flatMap((m) => (m.type === 'scan' ? m.updates : []));
    expect(updates.some((u) => u.status === 'confirmed' && u.moving)).toBe(true);
  });

  it('recorded each live run to its own session file, with all its detections', async () => {
    await client.close();
    await bridge.close();
    const sessions = await listSessions(sessionsDir);
    expect(sessions).toHaveLength(2);
    const counts = sessions.map((s) => s.detections).sort((a, b) => a - b);
    const det = (ls: typeof lines) => ls.filter((l) => l.record.kind === 'detection').length;
    expect(counts).toEqual([det(lines.filter((l) => l.timeS < RESTART_S)), det(lines)]);
    expect(sessions.every((s) => s.tracks > 0)).toBe(true);
  });
});
