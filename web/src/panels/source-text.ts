/** Words and symbols for the source state (testable without rendering the panel). */
import type { ReplayState, SourceStatus } from '../../../bridge/server/protocol.ts';
import { formatMs, formatRate } from '../stream/format.ts';

export interface SourceSummary {
  /** Stable machine name, also used by the end-to-end test. */
  state: 'connecting' | 'disconnected' | 'live' | 'waiting' | 'replay-playing' | 'replay-paused' | 'replay-ended' | 'idle';
  text: string;
  symbol: string;
  tone: 'good' | 'warn' | 'bad';
}

export function describeSource(connection: 'connecting' | 'open' | 'closed', src: SourceStatus | null): SourceSummary {
  if (connection === 'connecting') return { state: 'connecting', text: 'Connecting to the bridge…', symbol: '…', tone: 'warn' };
  if (connection === 'closed') return { state: 'disconnected', text: 'Bridge disconnected — retrying', symbol: '✕', tone: 'bad' };
  if (!src || src.kind === 'none') return { state: 'idle', text: 'No source open', symbol: '○', tone: 'warn' };
  if (src.kind === 'serial') {
    if (src.state === 'live') return { state: 'live', text: 'Live serial', symbol: '●', tone: 'good' };
    if (src.state === 'waiting') return { state: 'waiting', text: 'Waiting for serial port', symbol: '◌', tone: 'warn' };
    return { state: 'disconnected', text: 'Serial port disconnected', symbol: '✕', tone: 'bad' };
  }
  if (src.state === 'playing') return { state: 'replay-playing', text: 'Replay playing', symbol: '▶', tone: 'good' };
  if (src.state === 'ended') return { state: 'replay-ended', text: 'Replay ended', symbol: '■', tone: 'warn' };
  return { state: 'replay-paused', text: 'Replay paused', symbol: '❚❚', tone: 'warn' };
}

/** The rate and latency lines of the source panel. */
export interface SourceFigures {
  rateLabel: string;
  rate: string;
  latencyLabel: string;
  latency: string;
}

/**
 * A replay's bridge counts detections per second of wall clock, so 26 det/s played at 5× read
 * "130 det/s": what the run had is that divided by the speed. Its latency is from a line read
 * off the disk to the update leaving, not from the hardware, so it is not shown as one.
 */
export function sourceFigures(src: SourceStatus, replay: ReplayState | null): SourceFigures {
  if (src.kind !== 'replay') {
    return { rateLabel: 'Detections', rate: formatRate(src.detectionsPerSecond), latencyLabel: 'Latency (median)', latency: formatMs(src.latencyMs) };
  }
  const speed = replay?.speed ?? 1;
  const playing = src.state === 'playing' && speed > 0;
  return {
    rateLabel: 'Detections (run time)',
    rate: playing ? formatRate(src.detectionsPerSecond / speed) : '—',
    latencyLabel: 'Latency',
    latency: 'n/a (replay)',
  };
}
