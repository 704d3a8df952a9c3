/**
 * The fan-out's lag rules against sockets whose unsent bytes the test controls exactly (a real
 * loopback socket hands megabytes to the kernel at once, which hides them).
 */
import { EventEmitter } from 'node:events';
import { EchotrailError } from '../../bridge/errors.ts';
import { afterEach, describe, expect, it } from 'vitest';
import type { WebSocket } from 'ws';
import { Hub, type HubOptions } from '../../bridge/server/hub.ts';
import type { ServerMessage } from '../../bridge/server/protocol.ts';

/** Counts what was sent; `drain(n)` lets n bytes leave. */
class FakeSocket extends EventEmitter {
  readonly OPEN = 1;
  readyState = 1;
  sent: ServerMessage[] = [];
  queued = 0;
  terminated = false;
  get bufferedAmount(): number {
    return this.queued;
  }
  send(buf: Buffer): void {
    this.queued += buf.length;
    this.sent.push(JSON.parse(buf.toString()) as ServerMessage);
  }
  drain(n = Infinity): void {
    this.queued = Math.max(0, this.queued - n);
  }
  ping(): void {}
  terminate(): void {
    this.terminated = true;
    this.readyState = 3;
    this.emit('close');
  }
  close(): void {
    this.terminate();
  }
}

const hubs: Hub[] = [];
function hub(snapshotBytes: number, extra: Partial<HubOptions> = {}): Hub {
  const h = new Hub({
    maxBufferedBytes: 8 * 1024,
    resumeBufferedBytes: 1024,
    maxLagMs: 60_000,
    pingIntervalMs: 60_000,
    hello: () => ({ type: 'hello', protocol: 1, server: 'test' }),
    snapshot: () => ({ type: 'error', code: 'SNAPSHOT', message: 'x'.repeat(snapshotBytes) }),
    onClientMessage: () => undefined,
    ...extra,
  });
  hubs.push(h);
  return h;
}
const scan = (seq: number): ServerMessage => ({ type: 'scan', seq, timeS: seq, detections: [], updates: [], deletions: [], antennaAzimuthRad: null, positioner: [] });
const tick = (): Promise<void> => new Promise((r) => setTimeout(r, 120));
const seqs = (s: FakeSocket): number[] => s.sent.flatMap((m) => (m.type === 'scan' ? [m.seq as number] : []));
const snapshots = (s: FakeSocket): number => s.sent.filter((m) => m.type === 'error' && m.code === 'SNAPSHOT').length;

afterEach(() => hubs.splice(0).forEach((h) => h.close()));

describe('Hub lag rules', () => {
  it('does not count a snapshot larger than the threshold as lag', async () => {
    const h = hub(100_000);
    const s = new FakeSocket();
    h.add(s as unknown as WebSocket);
    for (let i = 0; i < 5; i++) h.broadcast(scan(i));
    expect(seqs(s)).toEqual([0, 1, 2, 3, 4]);
    s.drain();
    await tick();
    // Snapshot gone: the ordinary threshold applies again.
    for (let i = 5; i < 200; i++) h.broadcast(scan(i));
    expect(seqs(s).length).toBeLessThan(200);
    expect(h.stats.scansSkipped).toBeGreaterThan(0);
    expect(snapshots(s)).toBe(1);
  });

  it('skips scans for a lagging socket, resumes it with one snapshot, and never delays the others', async () => {
    const h = hub(100);
    const slow = new FakeSocket();
    const fast = new FakeSocket();
    h.add(slow as unknown as WebSocket);
    h.add(fast as unknown as WebSocket);
    slow.drain();
    for (let i = 0; i < 300; i++) {
      h.broadcast(scan(i));
      fast.drain();
    }
    expect(seqs(fast)).toEqual(Array.from({ length: 300 }, (_, i) => i));
    const before = seqs(slow).length;
    expect(before).toBeLessThan(300);
    slow.drain();
    await tick();
    expect(snapshots(slow)).toBe(2);
    h.broadcast(scan(300));
    expect(seqs(slow).at(-1)).toBe(300);
  });

  it('drops a socket that lags longer than maxLagMs', async () => {
    const h = hub(100, { maxLagMs: 50 });
    const s = new FakeSocket();
    h.add(s as unknown as WebSocket);
    for (let i = 0; i < 300; i++) h.broadcast(scan(i));
    await tick();
    await tick();
    expect(s.terminated).toBe(true);
    expect(h.stats).toMatchObject({ dropped: 1, clients: 0 });
  });

  it('answers a message flood once per second and ignores the excess', async () => {
    const handled: string[] = [];
    const h = hub(100, { maxMessagesPerSecond: 5, onClientMessage: (m) => void handled.push(m.type) });
    const s = new FakeSocket();
    h.add(s as unknown as WebSocket);
    for (let i = 0; i < 20; i++) s.emit('message', Buffer.from('{"type":"list-sessions"}'), false);
    await tick();
    expect(handled).toHaveLength(5);
    expect(s.sent.filter((m) => m.type === 'error' && m.code === 'E_PROTOCOL')).toHaveLength(1);
    expect(h.stats.badMessages).toBe(15);
  });

  it("answers a failed request with the error's own code, or E_INTERNAL for a code that is not ours", async () => {
    const failures: unknown[] = [new EchotrailError('E_PATH', 'no session named x'), Object.assign(new Error('ENOENT: no such file'), { code: 'ENOENT' }), new Error('boom')];
    const h = hub(100, { onClientMessage: () => { throw failures.shift(); } });
    const s = new FakeSocket();
    h.add(s as unknown as WebSocket);
    for (let i = 0; i < 3; i++) s.emit('message', Buffer.from('{"type":"list-sessions"}'), false);
    await tick();
    const codes = s.sent.filter((m) => m.type === 'error' && m.code !== 'SNAPSHOT').map((m) => (m as { code: string }).code);
    expect(codes).toEqual(['E_PATH', 'E_INTERNAL', 'E_INTERNAL']);
  });
});
