/**
 * The messages besides scans, and when they go: the source status line (every second, at once on
 * a change, at most every 250 ms during a flood of bad lines), the replay state (four times a
 * second, only when it changed unless forced), the fixed-echo map (only when it changed) and the
 * comparison figures (every second, after the status). Kept apart from the pipeline, which decides
 * what happened; this decides how often clients hear of it, with its own timers.
 */
import type { FixedEcho } from '../types.ts';
import type { ReplayState, ServerMessage, SourceStatus } from './protocol.ts';
import type { LiveState } from './state.ts';

/** How often source status, fixed echoes and comparison figures are refreshed, ms. */
const STATUS_MS = 1000;
/** How often the replay state is looked at (and sent when it changed), ms. */
const REPLAY_MS = 250;
/** Bad lines can come in floods; one status message per this many ms is plenty. */
const BAD_LINE_STATUS_MS = 250;

/** What the ticker reads and where it sends; the pipeline fills these. */
export interface StatusTickerOptions {
  /** Hands one message to every client (the pipeline's 'message' event). */
  emit: (msg: ServerMessage) => void;
  /** The source status line as it is now. */
  status: () => SourceStatus;
  /** The replay state as it is now; null when the input is no replay. */
  replayState: () => ReplayState | null;
  /** The tracker's fixed-echo map now; null when no tracker runs (the source carries its tracks). */
  trackerFixedEchoes: () => FixedEcho[] | null;
  /** The comparison messages due on a status tick (none while the figures are stale). */
  comparisonMessages: () => ServerMessage[];
  /** The live state: fixed echoes that changed are kept there for snapshots. */
  state: LiveState;
}

export class StatusTicker {
  private readonly timers: NodeJS.Timeout[];
  private statusTimer: NodeJS.Timeout | null = null;
  private lastReplayJson = '';
  private fixedSignature = '';

  constructor(private readonly o: StatusTickerOptions) {
    this.timers = [setInterval(() => this.tickStatus(), STATUS_MS), setInterval(() => this.tickReplay(), REPLAY_MS)];
  }

  /** Sends the source status line now. */
  sendStatus(): void {
    this.o.emit({ type: 'source', source: this.o.status() });
  }

  /** Sends the source status line soon: a flood of bad lines gets one message per BAD_LINE_STATUS_MS. */
  scheduleStatus(): void {
    if (this.statusTimer) return;
    this.statusTimer = setTimeout(() => {
      this.statusTimer = null;
      this.sendStatus();
    }, BAD_LINE_STATUS_MS);
  }

  /** Sends the replay state when it changed (or always, after a control). */
  tickReplay(force = false): void {
    const r = this.o.replayState();
    if (!r) return;
    const json = JSON.stringify(r);
    if (!force && json === this.lastReplayJson) return;
    this.lastReplayJson = json;
    this.o.emit({ type: 'replay', replay: r });
  }

  /** Keeps and sends the fixed echoes, unless they are those sent last (the tracker reports its map every second). */
  fixedEchoes(echoes: FixedEcho[]): void {
    const sig = `${echoes.length}:${echoes.reduce((s, e) => s + e.seen + e.x * 7 + e.y * 13, 0)}`;
    if (sig === this.fixedSignature) return;
    this.fixedSignature = sig;
    this.o.state.fixedEchoes = echoes;
    this.o.emit({ type: 'fixed-echoes', echoes });
  }

  /** The picture started again (new source, new run, seek): the next fixed echoes go out whatever they are. */
  forgetFixedEchoes(): void {
    this.fixedSignature = '';
  }

  close(): void {
    for (const t of this.timers) clearInterval(t);
    if (this.statusTimer) clearTimeout(this.statusTimer);
  }

  private tickStatus(): void {
    const echoes = this.o.trackerFixedEchoes();
    if (echoes) this.fixedEchoes(echoes);
    this.sendStatus();
    for (const msg of this.o.comparisonMessages()) this.o.emit(msg);
  }
}
