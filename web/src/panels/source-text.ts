/** Words and symbols for the source state (testable without rendering the panel). */
import type { SourceStatus } from '../../../bridge/server/protocol.ts';

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
