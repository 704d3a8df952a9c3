/**
 * A real `ws` client for tests that validates every frame with the protocol's zod schema and
 * lets a test wait for the next message that matches a predicate.
 */
import WebSocket from 'ws';
import { serverMessage, type ServerMessage } from '../../bridge/server/protocol.ts';

export class TestClient {
  readonly messages: ServerMessage[] = [];
  readonly invalid: string[] = [];
  private waiters: { match: (m: ServerMessage) => boolean; resolve: (m: ServerMessage) => void; from: number }[] = [];
  closeCode: number | null = null;
  private closed: Promise<number>;

  private constructor(readonly ws: WebSocket) {
    ws.on('message', (data) => {
      const parsed = serverMessage.safeParse(JSON.parse(String(data)));
      if (!parsed.success) {
        this.invalid.push(String(data).slice(0, 300));
        return;
      }
      this.messages.push(parsed.data);
      this.waiters = this.waiters.filter((w) => {
        if (!w.match(parsed.data)) return true;
        w.resolve(parsed.data);
        return false;
      });
    });
    this.closed = new Promise((r) => ws.on('close', (code) => r((this.closeCode = code))));
  }

  static async connect(url: string, options: WebSocket.ClientOptions = {}): Promise<TestClient> {
    const ws = new WebSocket(url, options);
    const c = new TestClient(ws);
    await new Promise<void>((resolve, reject) => {
      ws.once('open', () => resolve());
      ws.once('error', reject);
    });
    return c;
  }

  /** The first message (already received or future) of `type` matching `match`. */
  next<T extends ServerMessage['type']>(type: T, match: (m: Extract<ServerMessage, { type: T }>) => boolean = () => true, fromIndex = 0): Promise<Extract<ServerMessage, { type: T }>> {
    const test = (m: ServerMessage): boolean => m.type === type && match(m as Extract<ServerMessage, { type: T }>);
    const seen = this.messages.slice(fromIndex).find(test);
    if (seen) return Promise.resolve(seen as Extract<ServerMessage, { type: T }>);
    return new Promise((resolve) => this.waiters.push({ match: test, resolve: resolve as (m: ServerMessage) => void, from: fromIndex }));
  }

  of<T extends ServerMessage['type']>(type: T): Extract<ServerMessage, { type: T }>[] {
    return this.messages.filter((m) => m.type === type) as Extract<ServerMessage, { type: T }>[];
  }

  send(value: unknown): void {
    this.ws.send(typeof value === 'string' ? value : JSON.stringify(value));
  }

  whenClosed(): Promise<number> {
    return this.closed;
  }

  /** Stops reading from the socket, as a stuck browser tab would (bytes pile up at the server). */
  pauseReading(): void {
    (this.ws as unknown as { _socket: { pause(): void } })._socket.pause();
  }

  resumeReading(): void {
    (this.ws as unknown as { _socket: { resume(): void } })._socket.resume();
  }

  async close(): Promise<void> {
    if (this.ws.readyState === WebSocket.CLOSED) return;
    // A paused socket would never see the server's close: read again, and give up after a second.
    (this.ws as unknown as { _socket?: { resume(): void } })._socket?.resume();
    this.ws.close();
    const timer = setTimeout(() => this.ws.terminate(), 1000);
    await this.closed;
    clearTimeout(timer);
  }
}
