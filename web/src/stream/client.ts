/**
 * The one WebSocket connection to the bridge. Frames are validated with the shared zod schema,
 * queued, and applied together once per animation frame; listeners hear once per frame at most.
 */
import { clientMessage, serverMessage, type ClientMessage } from '../../../bridge/server/protocol.ts';
import { applyMessage } from './reduce.ts';
import { type DashboardState, type StateLimits, createState, defaultLimits } from './state.ts';
import { pageToken, withToken } from './token.ts';

export interface StreamClientOptions {
  /** WebSocket URL; defaults to /ws on the page's own host. */
  url?: string;
  limits?: StateLimits;
  /** Longest wait between reconnection attempts, ms. */
  maxBackoffMs?: number;
}

/** Frames held for the next animation frame before they are applied without waiting for it. */
const MAX_QUEUED_FRAMES = 2000;

export type FrameListener = (state: DashboardState) => void;

export class StreamClient {
  readonly state: DashboardState = createState();
  private readonly url: string;
  private readonly limits: StateLimits;
  private readonly maxBackoffMs: number;
  private socket: WebSocket | null = null;
  private queue: string[] = [];
  private frameRequested = false;
  private listeners = new Set<FrameListener>();
  private backoffMs = 250;
  private closedByUser = false;

  constructor(options: StreamClientOptions = {}) {
    const proto = location.protocol === 'https:' ? 'wss:' : 'ws:';
    this.url = options.url ?? withToken(`${proto}//${location.host}/ws`, pageToken());
    this.limits = options.limits ?? defaultLimits;
    this.maxBackoffMs = options.maxBackoffMs ?? 5000;
  }

  /** Pending reconnection after a drop; cleared by close() so a closed client stays closed. */
  private reconnectTimer: ReturnType<typeof setTimeout> | null = null;

  connect(): void {
    this.closedByUser = false;
    this.state.connection = 'connecting';
    const ws = new WebSocket(this.url);
    this.socket = ws;
    ws.onopen = () => {
      this.backoffMs = 250;
      this.state.connection = 'open';
      this.send({ type: 'list-sessions' });
      this.requestFrame();
    };
    ws.onmessage = (ev) => {
      if (typeof ev.data !== 'string') return;
      this.queue.push(ev.data);
      // A hidden tab gets no animation frames: apply a long backlog now rather than hold it.
      if (this.queue.length >= MAX_QUEUED_FRAMES) this.drain();
      this.requestFrame();
    };
    ws.onclose = () => {
      this.state.connection = 'closed';
      this.requestFrame();
      if (this.closedByUser) return;
      this.reconnectTimer = setTimeout(() => {
        this.reconnectTimer = null;
        if (!this.closedByUser) this.connect();
      }, this.nextBackoff());
    };
  }

  close(): void {
    this.closedByUser = true;
    if (this.reconnectTimer !== null) clearTimeout(this.reconnectTimer);
    this.reconnectTimer = null;
    this.socket?.close();
  }

  /** Send a control message; refused locally if it would not pass the server's schema. */
  send(msg: ClientMessage): boolean {
    const checked = clientMessage.safeParse(msg);
    if (!checked.success || this.socket?.readyState !== WebSocket.OPEN) return false;
    this.socket.send(JSON.stringify(checked.data));
    return true;
  }

  onFrame(listener: FrameListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private nextBackoff(): number {
    const wait = this.backoffMs;
    this.backoffMs = Math.min(this.maxBackoffMs, this.backoffMs * 2);
    return wait;
  }

  private requestFrame(): void {
    if (this.frameRequested) return;
    this.frameRequested = true;
    requestAnimationFrame(() => this.flush());
  }

  private drain(): void {
    const batch = this.queue;
    this.queue = [];
    for (const text of batch) applyFrame(this.state, text, this.limits);
  }

  private flush(): void {
    this.frameRequested = false;
    this.drain();
    for (const l of this.listeners) l(this.state);
  }
}

/** Parse and validate one text frame; refused frames are counted, never applied. */
export function applyFrame(state: DashboardState, text: string, limits: StateLimits = defaultLimits): boolean {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    state.invalidFrames++;
    state.lastInvalid = 'not JSON';
    return false;
  }
  const parsed = serverMessage.safeParse(json);
  if (!parsed.success) {
    state.invalidFrames++;
    const issue = parsed.error.issues[0];
    state.lastInvalid = issue ? `${issue.path.join('.') || 'frame'}: ${issue.message}` : 'schema mismatch';
    return false;
  }
  applyMessage(state, parsed.data, limits);
  return true;
}
