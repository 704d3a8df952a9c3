/**
 * `echotrail feed` as a stand-in for the acquisition hardware: the real command writes a
 * simulated turntable run into one end of a socat pty pair, the real bridge reads the other end
 * with default tracker settings (antenna and noise inferred), and a WebSocket client sees a
 * confirmed track on the turntable circle, the positioner's samples and no bad lines.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startBridge, type RunningBridge } from '../../bridge/server/bridge.ts';
import { SCENARIOS } from '../../bridge/sim/scenarios.ts';
import { PtyPair, socatAvailable } from '../helpers/socat.ts';
import { TestClient } from '../helpers/ws-client.ts';

const ROOT = join(import.meta.dirname, '..', '..');

describe.skipIf(!socatAvailable())('echotrail feed → serial → bridge → WebSocket', () => {
  const dir = mkdtempSync(join(tmpdir(), 'et-feed-'));
  const pty = new PtyPair(dir);
  let bridge: RunningBridge;
  let client: TestClient;
  let feeder: ChildProcess;

  beforeAll(async () => {
    await pty.start();
    bridge = await startBridge({ port: 0, sessionsDir: join(dir, 'sessions'), serial: { path: pty.device, baudRate: 115200 }, log: () => undefined });
    client = await TestClient.connect(bridge.wsUrl);
    await client.next('source', (m) => m.source.state === 'live');
    feeder = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'bridge/cli/main.ts'), 'feed', '--port', pty.hardware, '--scenario', 'turntable', '--speed', '8'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
  });

  afterAll(async () => {
    feeder?.kill('SIGINT');
    await client?.close();
    await bridge?.close();
    await pty.stop();
  });

  it('gives a confirmed track on the commanded circle, with positioner samples and no bad lines', async () => {
    const spec = SCENARIOS.turntable.targets![0].trajectory as { center: { x: number; y: number }; radiusM: number };
    const onCircle = (x: number, y: number) => Math.abs(Math.hypot(x - spec.center.x, y - spec.center.y) - spec.radiusM) < 0.25;
    const scan = await client.next('scan', (s) => s.updates.filter((u) => u.status === 'confirmed' && u.moving && onCircle(u.x, u.y)).length > 0);
    expect(scan.detections.length + scan.updates.length).toBeGreaterThan(0);
    await client.next('scan', (s) => s.positioner.length > 0);
    const pos = client.of('scan').flatMap((s) => s.positioner);
    // The feed sends the commanded circle; every sample lies on it to the line protocol's 0.1 mm
    // resolution (docs/line-protocol.md).
    for (const p of pos) expect(Math.abs(Math.hypot(p.cmdX - spec.center.x, p.cmdY - spec.center.y) - spec.radiusM)).toBeLessThan(2e-4);
    const source = client.of('source').at(-1)!.source;
    expect(source.badLines).toBe(0);
    expect(source.recording).toMatch(/\.session\.jsonl$/);
  });
});

describe.skipIf(!socatAvailable())('echotrail feed of two carriages → serial → bridge → WebSocket', () => {
  const dir = mkdtempSync(join(tmpdir(), 'et-feed-pair-'));
  const pty = new PtyPair(dir);
  let bridge: RunningBridge;
  let feeder: ChildProcess;
  const clients: TestClient[] = [];

  beforeAll(async () => {
    await pty.start();
    bridge = await startBridge({ port: 0, sessionsDir: join(dir, 'sessions'), serial: { path: pty.device, baudRate: 115200 }, log: () => undefined });
    const c = await TestClient.connect(bridge.wsUrl);
    clients.push(c);
    await c.next('source', (m) => m.source.state === 'live');
    feeder = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'bridge/cli/main.ts'), 'feed', '--port', pty.hardware, '--scenario', 'crossing-pair', '--speed', '6'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
  });

  afterAll(async () => {
    feeder?.kill('SIGINT');
    await Promise.all(clients.map((c) => c.close()));
    await bridge?.close();
    await pty.stop();
    rmSync(dir, { recursive: true, force: true });
  });

  it('each carriage names itself (pos … id=): a path and a comparison each, with its own track', async () => {
    const c = clients[0];
    const one = await c.next('comparison', (m) => m.figures.pathId === '1' && m.figures.samples > 5);
    const two = await c.next('comparison', (m) => m.figures.pathId === '2' && m.figures.samples > 5);
    expect(one.figures.trackId).not.toBe(two.figures.trackId);
    // Each track follows its own carriage: decimetres (its first scans, starting from rest, with
    // the default 1.5° azimuth noise), not the 3 m between the two carriages at the start.
    expect(one.figures.rmseM!).toBeLessThan(0.6);
    expect(two.figures.rmseM!).toBeLessThan(0.6);
    const targets = new Set(c.of('scan').flatMap((s) => s.positioner.map((p) => p.target)));
    expect([...targets].sort()).toEqual(['1', '2']);
    // A client that joins now gets both paths by name, marked as built from positioner samples.
    const late = await TestClient.connect(bridge.wsUrl);
    clients.push(late);
    const snap = await late.next('snapshot');
    expect(snap.commandedFrom).toBe('positioner');
    expect(snap.commandedPaths?.map((p) => p.target)).toEqual(['1', '2']);
    for (const p of snap.commandedPaths ?? []) expect(p.path.length).toBeGreaterThan(10);
  });
});

describe.skipIf(!socatAvailable())('echotrail feed when the port goes away', () => {
  it('ends with one E_SERIAL line and exit code 1, not an unhandled error event', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'et-feed-lost-'));
    const pty = new PtyPair(dir);
    await pty.start();
    const feeder = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'bridge/cli/main.ts'), 'feed', '--port', pty.hardware, '--scenario', 'turntable', '--loop'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    feeder.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
    const exited = new Promise<number | null>((res) => feeder.once('exit', (code) => res(code)));
    try {
      // The timeout only stops a hung test.
      for (let i = 0; i < 1000 && !stderr.includes('Ctrl-C stops'); i++) await new Promise((r) => setTimeout(r, 20));
      expect(stderr).toContain('Ctrl-C stops');
      await pty.stop();
      const code = await exited;
      expect(code).toBe(1);
      const lines = stderr.trim().split('\n');
      expect(lines).toHaveLength(2);
      expect(lines[1]).toMatch(/^echotrail feed: E_SERIAL: lost '.*hw-end' after \d+ lines: /);
      expect(stderr).not.toMatch(/Unhandled|    at /);
    } finally {
      if (feeder.exitCode === null) feeder.kill('SIGKILL');
      await pty.stop();
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
