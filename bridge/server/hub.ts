/**
 * WebSocket fan-out. Each message is serialised once and handed to every client; a client whose
 * unsent bytes pass `maxBufferedBytes` stops receiving increments (they would only pile up), gets
 * a fresh snapshot once it has drained below `resumeBufferedBytes`, and is dropped if it lags for
 * longer than `maxLagMs`. So a slow client costs the others nothing but one length check.
 */
import type { WebSocket, RawData } from 'ws';
import type { ClientMessage, ServerMessage } from './protocol.ts';
import { clientMessage } from './protocol.ts';
import { isErrorCode } from '../errors.ts';

/** Fan-out limits, copied from the bridge options. */
export interface HubOptions {
  /** Unsent bytes above which a client lags. */
  maxBufferedBytes: number;
  /** Unsent bytes below which a lagging client resumes with a snapshot. */
  resumeBufferedBytes: number;
  /** Lagging longer than this drops the client, ms. */
  maxLagMs: number;
  /** Ping interval; no pong by the next ping drops the client, ms. */
  pingIntervalMs: number;
  /** Most control messages a client may send per second; the excess is refused (a seek re-tracks, an open indexes a file). */
  maxMessagesPerSecond?: number;
  /** The messages a client gets on connect and on resync (hello is sent once). */
  snapshot: () => ServerMessage;
  hello: () => ServerMessage;
  /** Handles a valid control message; may throw an error with a `code` to be answered. */
  onClientMessage: (msg: ClientMessage, reply: (m: ServerMessage) => void) => void | Promise<void>;
}

/** Counters for /api/health and tests. */
export interface HubStats {
  clients: number;
  lagging: number;
  dropped: number;
  badMessages: number;
  scansSkipped: number;
}

/** Non-increment replies (errors, session lists) may use this many times the normal cap. */
const REPLY_SLACK = 4;
const CHECK_MS = 50;

class Client {
  lagSince: number | null = null;
  alive = true;
  /**
   * Bytes of the last snapshot that may still be queued. A snapshot can be larger than the lag
   * threshold by itself; without this allowance a client would lag on every snapshot, get another
   * on catching up, and never see a scan.
   */
  allowance = 0;
  /** Start of the current one-second window of incoming messages, and the count in it. */
  windowStart = 0;
  windowCount = 0;
  constructor(readonly ws: WebSocket) {}
}

export class Hub {
  private readonly clients = new Set<Client>();
  private readonly timers: NodeJS.Timeout[];
  readonly stats: HubStats = { clients: 0, lagging: 0, dropped: 0, badMessages: 0, scansSkipped: 0 };

  constructor(private readonly o: HubOptions) {
    this.timers = [setInterval(() => this.checkLagging(), CHECK_MS), setInterval(() => this.ping(), o.pingIntervalMs)];
    for (const t of this.timers) t.unref();
  }

  get size(): number {
    return this.clients.size;
  }

  add(ws: WebSocket): void {
    const c = new Client(ws);
    this.clients.add(c);
    this.stats.clients = this.clients.size;
    ws.on('pong', () => (c.alive = true));
    ws.on('message', (data, isBinary) => this.receive(c, data, isBinary));
    ws.on('close', () => this.remove(c));
    // Errors (1009 oversized frame, resets) close the socket; the close handler tidies up.
    ws.on('error', () => undefined);
    this.sendNow(c, this.o.hello());
    this.sendSnapshot(c, Buffer.from(JSON.stringify(this.o.snapshot())));
  }

  private sendSnapshot(c: Client, buf: Buffer): void {
    c.allowance = buf.length;
    this.sendNow(c, buf);
  }

  private remove(c: Client): void {
    if (this.clients.delete(c)) this.stats.clients = this.clients.size;
  }

  private sendNow(c: Client, msg: ServerMessage | Buffer): void {
    if (c.ws.readyState !== c.ws.OPEN) return;
    const buf = Buffer.isBuffer(msg) ? msg : Buffer.from(JSON.stringify(msg));
    c.ws.send(buf, { binary: false });
  }

  /**
   * Increment to every client that keeps up. `kind` 'scan' is skipped for lagging clients (the
   * snapshot they get on catching up includes it); 'state' likewise.
   */
  broadcast(msg: ServerMessage): void {
    if (this.clients.size === 0) return;
    const buf = Buffer.from(JSON.stringify(msg));
    const now = Date.now();
    for (const c of this.clients) {
      if (c.lagSince === null && c.ws.bufferedAmount > this.o.maxBufferedBytes + c.allowance) c.lagSince = now;
      if (c.lagSince !== null) {
        if (msg.type === 'scan') this.stats.scansSkipped++;
        continue;
      }
      this.sendNow(c, buf);
    }
  }

  /** Everyone gets a fresh snapshot (the state was rebuilt). */
  resync(): void {
    if (this.clients.size === 0) return;
    const buf = Buffer.from(JSON.stringify(this.o.snapshot()));
    for (const c of this.clients) if (c.lagSince === null) this.sendSnapshot(c, buf);
  }

  private reply(c: Client, msg: ServerMessage): void {
    if (c.ws.bufferedAmount > this.o.maxBufferedBytes * REPLY_SLACK) return;
    this.sendNow(c, msg);
  }

  private receive(c: Client, data: RawData, isBinary: boolean): void {
    const fail = (code: string, message: string): void => {
      this.stats.badMessages++;
      this.reply(c, { type: 'error', code, message });
    };
    const now = Date.now();
    if (now - c.windowStart >= 1000) {
      c.windowStart = now;
      c.windowCount = 0;
    }
    const limit = this.o.maxMessagesPerSecond ?? 50;
    if (++c.windowCount > limit) {
      // One answer per window is enough; the rest are counted and ignored.
      this.stats.badMessages++;
      if (c.windowCount === limit + 1) this.reply(c, { type: 'error', code: 'E_PROTOCOL', message: `more than ${limit} messages in a second; the rest of this second is ignored` });
      return;
    }
    if (isBinary) return fail('E_PROTOCOL', 'binary frames are not accepted; send JSON text');
    let parsed: unknown;
    try {
      parsed = JSON.parse(Buffer.isBuffer(data) ? data.toString('utf8') : Buffer.concat(data as Buffer[]).toString('utf8'));
    } catch {
      return fail('E_PROTOCOL', 'message is not valid JSON');
    }
    const result = clientMessage.safeParse(parsed);
    if (!result.success) {
      const issue = result.error.issues[0];
      const where = issue?.path.length ? ` at ${issue.path.join('.')}` : '';
      return fail('E_PROTOCOL', `invalid message${where}: ${issue?.message ?? 'unknown shape'}`);
    }
    const answer = (m: ServerMessage): void => this.reply(c, m);
    Promise.resolve()
      .then(() => this.o.onClientMessage(result.data, answer))
      .catch((err: unknown) => {
        // Only the documented codes go out: a Node error's own code (ENOENT…) would mean nothing
        // to the dashboard, and an error without one is a fault of ours, not of the request.
        const own = (err as { code?: unknown }).code;
        const code = isErrorCode(own) ? own : 'E_INTERNAL';
        fail(code, (err as Error).message ?? String(err));
      });
  }

  private checkLagging(): void {
    const now = Date.now();
    let lagging = 0;
    let snapshot: Buffer | null = null;
    for (const c of this.clients) {
      if (c.lagSince === null) {
        if (c.allowance && c.ws.bufferedAmount <= this.o.resumeBufferedBytes) c.allowance = 0;
        continue;
      }
      if (c.ws.bufferedAmount <= this.o.resumeBufferedBytes) {
        c.lagSince = null;
        snapshot ??= Buffer.from(JSON.stringify(this.o.snapshot()));
        this.sendSnapshot(c, snapshot);
      } else if (now - c.lagSince > this.o.maxLagMs) {
        this.drop(c);
      } else lagging++;
    }
    this.stats.lagging = lagging;
  }

  private drop(c: Client): void {
    this.stats.dropped++;
    this.remove(c);
    c.ws.terminate();
  }

  private ping(): void {
    for (const c of this.clients) {
      if (!c.alive) {
        this.drop(c);
        continue;
      }
      c.alive = false;
      c.ws.ping();
    }
  }

  /** Closes every client with 1001 (going away). */
  close(): void {
    for (const t of this.timers) clearInterval(t);
    for (const c of this.clients) {
      c.ws.close(1001, 'bridge shutting down');
      setTimeout(() => c.ws.terminate(), 500).unref();
    }
    this.clients.clear();
  }
}
