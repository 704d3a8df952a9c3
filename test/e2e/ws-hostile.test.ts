/**
 * Hostile and slow WebSocket clients against a real bridge: bad frames are answered and counted,
 * oversized frames close the socket (1009), foreign origins, hosts and missing tokens are refused,
 * and a client that stops reading never holds back one that keeps up.
 */
import { afterEach, describe, expect, it } from 'vitest';
import { get } from 'node:http';
import { connect as connectTcp } from 'node:net';
import { randomBytes } from 'node:crypto';
import WebSocket from 'ws';
import { startBridge, type RunningBridge } from '../../bridge/server/bridge.ts';
import type { BridgeOptions } from '../../bridge/server/options.ts';
import { ScriptedSource } from '../helpers/scripted-source.ts';
import { TestClient } from '../helpers/ws-client.ts';

let bridge: RunningBridge | null = null;
const clients: TestClient[] = [];

async function start(extra: Partial<BridgeOptions> = {}, source = new ScriptedSource()): Promise<{ b: RunningBridge; src: ScriptedSource }> {
  bridge = await startBridge({ port: 0, createSource: () => source, log: () => undefined, ...extra });
  return { b: bridge, src: source };
}

async function connect(url: string, options: WebSocket.ClientOptions = {}): Promise<TestClient> {
  const c = await TestClient.connect(url, options);
  clients.push(c);
  return c;
}

/** The HTTP status a refused upgrade answered with. */
function refusedStatus(url: string, options: WebSocket.ClientOptions = {}): Promise<number> {
  return new Promise((resolve, reject) => {
    const ws = new WebSocket(url, options);
    ws.on('unexpected-response', (_req, res) => {
      resolve(res.statusCode ?? 0);
      ws.terminate();
    });
    ws.on('open', () => reject(new Error('upgrade was accepted')));
    ws.on('error', () => undefined);
  });
}

const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

afterEach(async () => {
  await Promise.all(clients.splice(0).map((c) => c.close()));
  await bridge?.close();
  bridge = null;
});

describe('hostile frames', () => {
  it('answers malformed JSON, unknown types, bad values and binary frames with error, and keeps serving', async () => {
    const { b } = await start();
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    c.send('{"type": "control", "action": ');
    c.send({ type: 'reboot-radar' });
    c.send({ type: 'control', action: 'seek', value: 'soon' });
    c.ws.send(Buffer.from([1, 2, 3]), { binary: true });
    c.send({ type: 'control', action: 'pause' });
    await c.next('replay', (m) => !m.replay.playing);
    const errors = c.of('error');
    expect(errors.map((e) => e.code)).toEqual(['E_PROTOCOL', 'E_PROTOCOL', 'E_PROTOCOL', 'E_PROTOCOL']);
    expect(errors[0].message).toMatch(/not valid JSON/);
    expect(errors[1].message).toMatch(/invalid message/);
    expect(errors[2].message).toMatch(/value/);
    expect(errors[3].message).toMatch(/binary/);
    expect(b.stats().badMessages).toBe(4);
    expect(c.ws.readyState).toBe(WebSocket.OPEN);
  });

  it('closes a client that sends a frame over maxPayload with 1009, others unaffected', async () => {
    const { b } = await start({ maxPayloadBytes: 4096 });
    const other = await connect(b.wsUrl);
    const c = await connect(b.wsUrl);
    await c.next('snapshot');
    c.send({ type: 'open-session', sessionId: 'x'.repeat(5000) });
    expect(await c.whenClosed()).toBe(1009);
    other.send({ type: 'list-sessions' });
    expect((await other.next('sessions')).sessions).toEqual([]);
  });
});

describe('access', () => {
  it('refuses a foreign Origin, accepts its own and allow-listed ones', async () => {
    const { b } = await start({ allowedOrigins: ['http://localhost:5173'] });
    expect(await refusedStatus(b.wsUrl, { origin: 'http://evil.example' })).toBe(403);
    expect(await refusedStatus(b.wsUrl, { origin: 'not a url' })).toBe(403);
    const own = await connect(b.wsUrl, { origin: `http://127.0.0.1:${b.port}` });
    const dev = await connect(b.wsUrl, { origin: 'http://localhost:5173' });
    expect((await own.next('hello')).protocol).toBe(1);
    expect((await dev.next('hello')).protocol).toBe(1);
  });

  it('refuses a Host header that is not this machine on a loopback bind (DNS rebinding)', async () => {
    const { b } = await start();
    expect(await refusedStatus(b.wsUrl, { headers: { host: 'attacker.example' } })).toBe(403);
    const status = (host: string): Promise<number> =>
      new Promise((resolve, reject) => {
        get({ host: '127.0.0.1', port: b.port, path: '/api/health', headers: { host } }, (res) => {
          res.resume();
          resolve(res.statusCode ?? 0);
        }).on('error', reject);
      });
    expect(await status('attacker.example')).toBe(403);
    expect(await status(`localhost:${b.port}`)).toBe(200);
  });

  it('requires the token when told to: query or header, never absent or wrong', async () => {
    const { b } = await start({ requireToken: true, token: 'correct-horse-battery' });
    const bare = `ws://127.0.0.1:${b.port}/ws`;
    expect(await refusedStatus(bare)).toBe(401);
    expect(await refusedStatus(`${bare}?token=wrong-token-value`)).toBe(401);
    expect((await fetch(`http://127.0.0.1:${b.port}/api/health`)).status).toBe(401);
    expect((await fetch(`http://127.0.0.1:${b.port}/api/health?token=correct-horse-battery`)).status).toBe(200);
    const q = await connect(`${bare}?token=correct-horse-battery`);
    const h = await connect(bare, { headers: { 'x-echotrail-token': 'correct-horse-battery' } });
    expect(b.wsUrl).toContain('token=correct-horse-battery');
    expect((await q.next('snapshot')).type).toBe('snapshot');
    expect((await h.next('snapshot')).type).toBe('snapshot');
  });

  it('generates a token when one is required and none is given', async () => {
    const { b } = await start({ requireToken: true });
    expect(b.token).toMatch(/^[A-Za-z0-9_-]{20,}$/);
    expect(await refusedStatus(`ws://127.0.0.1:${b.port}/ws`)).toBe(401);
    expect((await (await connect(b.wsUrl)).next('hello')).type).toBe('hello');
  });

  it('answers 404 for upgrades on other paths', async () => {
    const { b } = await start();
    expect(await refusedStatus(`ws://127.0.0.1:${b.port}/socket`)).toBe(404);
  });
});

describe('dead and surplus clients', () => {
  it('drops a client that completes the upgrade but never answers pings', async () => {
    const { b } = await start({ pingIntervalMs: 100 });
    const sock = connectTcp(b.port, '127.0.0.1');
    await new Promise<void>((r) => sock.once('connect', () => r()));
    sock.write(`GET /ws HTTP/1.1\r\nHost: 127.0.0.1:${b.port}\r\nUpgrade: websocket\r\nConnection: Upgrade\r\nSec-WebSocket-Key: ${randomBytes(16).toString('base64')}\r\nSec-WebSocket-Version: 13\r\n\r\n`);
    let head = '';
    sock.on('data', (d: Buffer) => (head += d.toString('latin1')));
    const closed = new Promise<void>((r) => sock.once('close', () => r()));
    sock.on('error', () => undefined);
    const alive = await connect(b.wsUrl);
    await closed;
    expect(head.startsWith('HTTP/1.1 101')).toBe(true);
    expect(b.stats().dropped).toBeGreaterThanOrEqual(1);
    // The ws client answers pings by itself and stays.
    await sleep(300);
    expect(alive.ws.readyState).toBe(WebSocket.OPEN);
  });

  it('refuses clients beyond maxClients with 503', async () => {
    const { b } = await start({ maxClients: 2 });
    await connect(b.wsUrl);
    await connect(b.wsUrl);
    expect(await refusedStatus(b.wsUrl)).toBe(503);
  });
});

describe('a client that never reads', () => {
  /** Emits bursts of detections (large scans) until `until()` holds or `maxRounds` pass. */
  async function pump(src: ScriptedSource, until: () => boolean, maxRounds: number): Promise<number> {
    let t = 0;
    let rounds = 0;
    for (; rounds < maxRounds && !until(); rounds++) {
      for (let i = 0; i < 400; i++) src.emitRecord({ kind: 'detection', detection: { timeS: (t += 0.0005), azimuthRad: 1, rangeM: 2.5, amplitude: 10 + i } });
      await sleep(2);
    }
    return rounds;
  }

  it('does not hold back a client that keeps up: it gets every scan, in order', async () => {
    const { b, src } = await start({ scanRateHz: 1000, maxBufferedBytes: 256 * 1024, resumeBufferedBytes: 32 * 1024, maxLagMs: 60_000 });
    const produced: number[] = [];
    b.pipeline.on('scan', (s: { seq: number }) => produced.push(s.seq));
    const slow = await connect(b.wsUrl);
    await slow.next('snapshot');
    slow.pauseReading();
    const fast = await connect(b.wsUrl);
    await fast.next('snapshot');

    await pump(src, () => b.stats().scansSkipped > 0, 3000);
    expect(b.stats().scansSkipped).toBeGreaterThan(0);
    await pump(src, () => false, 20); // keep going while it lags
    const last = produced[produced.length - 1];
    await fast.next('scan', (s) => s.seq === last);
    // The fast client connected after the first scans; from its first one on it misses none.
    const fastSeqs = fast.of('scan').map((s) => s.seq as number);
    expect(fastSeqs.length).toBeGreaterThan(0);
    expect(fastSeqs).toEqual(produced.filter((s) => s >= fastSeqs[0]));

    // Reading again, the slow client drains, then gets a fresh snapshot that puts it back in step.
    slow.resumeReading();
    const firstSnap = slow.messages.findIndex((m) => m.type === 'snapshot');
    const resync = await slow.next('snapshot', () => true, firstSnap + 1);
    expect(resync.seq).toBeGreaterThan(0);
    const slowSeqs = slow.of('scan').map((s) => s.seq as number);
    expect(slowSeqs.length).toBeLessThan(produced.length);
    expect(slowSeqs).toEqual([...slowSeqs].sort((x, y) => x - y));
    expect(b.stats().dropped).toBe(0);
  });

  it('a snapshot larger than the lag threshold is followed by scans, without a second snapshot', async () => {
    // Over loopback the kernel takes the snapshot at once; test/server/hub.test.ts covers a socket that holds it.
    const { b, src } = await start({ scanRateHz: 1000, maxBufferedBytes: 8 * 1024, resumeBufferedBytes: 2 * 1024, maxLagMs: 60_000 });
    // About 200 KB of recent detections: the snapshot alone is 25 times the threshold.
    for (let i = 0; i < 2000; i++) src.emitRecord({ kind: 'detection', detection: { timeS: i * 0.001, azimuthRad: 1, rangeM: 2.5, amplitude: 10 + i } });
    await sleep(20);
    const c = await connect(b.wsUrl);
    for (let i = 0; i < 20; i++) {
      src.emitRecord({ kind: 'detection', detection: { timeS: 2 + i * 0.01, azimuthRad: 1, rangeM: 2.5, amplitude: 5 } });
      await sleep(5);
    }
    const last = 2 + 19 * 0.01;
    await c.next('scan', (s) => s.detections.some((d) => d.timeS === last));
    expect(c.of('snapshot')).toHaveLength(1);
    expect(c.of('snapshot')[0].detections.length).toBe(2000);
    expect(b.stats().scansSkipped).toBe(0);
  });

  it('drops a client that stays behind longer than maxLagMs; the others stay connected', async () => {
    const { b, src } = await start({ scanRateHz: 1000, maxBufferedBytes: 128 * 1024, resumeBufferedBytes: 16 * 1024, maxLagMs: 200 });
    const slow = await connect(b.wsUrl);
    await slow.next('snapshot');
    slow.pauseReading();
    const fast = await connect(b.wsUrl);
    await fast.next('snapshot');
    await pump(src, () => b.stats().dropped > 0, 5000);
    expect(b.stats().dropped).toBe(1);
    expect(b.stats().clients).toBe(1);
    expect(fast.ws.readyState).toBe(WebSocket.OPEN);
  });
});
