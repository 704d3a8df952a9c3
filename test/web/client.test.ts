import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { StreamClient } from '../../web/src/stream/client.ts';

/** A stand-in socket: the test plays the bridge by calling deliver(). */
class FakeSocket {
  static OPEN = 1;
  static last: FakeSocket | null = null;
  readyState = 0;
  sent: string[] = [];
  onopen: (() => void) | null = null;
  onmessage: ((e: { data: unknown }) => void) | null = null;
  onclose: (() => void) | null = null;
  constructor(readonly url: string) { FakeSocket.last = this; }
  open(): void { this.readyState = 1; this.onopen?.(); }
  deliver(m: unknown): void { this.onmessage?.({ data: typeof m === 'string' ? m : JSON.stringify(m) }); }
  send(s: string): void { this.sent.push(s); }
  close(): void { this.readyState = 3; this.onclose?.(); }
}

let frames: (() => void)[] = [];
const runFrame = () => { const f = frames; frames = []; f.forEach((cb) => cb()); };

beforeEach(() => {
  frames = [];
  vi.stubGlobal('WebSocket', FakeSocket);
  vi.stubGlobal('location', { protocol: 'http:', host: 'bench:8080', search: '?token=abc' });
  vi.stubGlobal('requestAnimationFrame', (cb: () => void) => { frames.push(cb); return frames.length; });
});
afterEach(() => vi.unstubAllGlobals());

const scan = (t: number) => ({ type: 'scan', timeS: t, detections: [], updates: [], deletions: [], antennaAzimuthRad: null, positioner: [] });

describe('StreamClient', () => {
  it('connects to /ws on the page host with the page token', () => {
    new StreamClient().connect();
    expect(FakeSocket.last?.url).toBe('ws://bench:8080/ws?token=abc');
  });

  it('applies a frame’s worth of messages together and notifies once', () => {
    const c = new StreamClient();
    const seen: number[] = [];
    c.onFrame((s) => seen.push(s.timeS));
    c.connect();
    const ws = FakeSocket.last!;
    ws.open();
    runFrame();
    seen.length = 0;
    ws.deliver(scan(1)); ws.deliver(scan(2)); ws.deliver(scan(3));
    expect(c.state.timeS).toBe(0); // nothing applied before the animation frame
    runFrame();
    expect(seen).toEqual([3]);
  });

  it('counts refused frames and asks for the session list on open', () => {
    const c = new StreamClient();
    c.connect();
    const ws = FakeSocket.last!;
    ws.open();
    ws.deliver('not json');
    ws.deliver({ type: 'scan', timeS: 'later' });
    runFrame();
    expect(c.state.invalidFrames).toBe(2);
    expect(ws.sent.map((s) => JSON.parse(s))).toEqual([{ type: 'list-sessions' }]);
  });

  it('refuses to send a control the bridge would reject', () => {
    const c = new StreamClient();
    c.connect();
    FakeSocket.last!.open();
    expect(c.send({ type: 'control', action: 'speed', value: 2 })).toBe(true);
    expect(c.send({ type: 'control', action: 'warp' } as never)).toBe(false);
    expect(FakeSocket.last!.sent).toHaveLength(2); // list-sessions + speed
  });

  it('applies a long backlog without waiting for a frame (hidden tab)', () => {
    const c = new StreamClient();
    c.connect();
    const ws = FakeSocket.last!;
    ws.open();
    for (let i = 1; i <= 2000; i++) ws.deliver(scan(i * 0.1));
    expect(c.state.timeS).toBeCloseTo(200);
  });

  it('marks the connection closed and reconnects after a pause', () => {
    vi.useFakeTimers();
    try {
      const c = new StreamClient();
      c.connect();
      const first = FakeSocket.last!;
      first.open();
      first.close();
      expect(c.state.connection).toBe('closed');
      vi.advanceTimersByTime(300);
      expect(FakeSocket.last).not.toBe(first);
      c.close();
    } finally {
      vi.useRealTimers();
    }
  });
});
