/**
 * What a client gets when it connects or after a resync: the `hello` greeting, then a `snapshot`
 * of the live state. Kept apart from the pipeline because it is a pure function of parts the
 * pipeline holds, with its own rules about what to leave out (detections the next scan brings,
 * comparison history that is stale, fields absent when there is nothing to say).
 */
import type { ReplayState, ServerMessage, SourceStatus } from './protocol.ts';
import { PROTOCOL_VERSION } from './protocol.ts';
import type { ScanBatch } from './scan-batch.ts';
import type { LiveState } from './state.ts';

export type SnapshotMessage = Extract<ServerMessage, { type: 'snapshot' }>;

/** What a snapshot is built from. */
export interface SnapshotParts {
  /** The live picture: tracks, history, recent detections, fixed echoes, commanded paths. */
  state: LiveState;
  /** The scan batch: its next sequence number and the detections it will carry. */
  batch: Pick<ScanBatch, 'nextSeq' | 'pendingDetections'>;
  /** The source status line. */
  source: SourceStatus;
  /** The running-RMSE history per commanded path; empty while the comparison is stale or absent. */
  comparisonHistory: { pathId: string; points: number[] }[];
  /** The replay state, or null when the input is no replay. */
  replay: ReplayState | null;
}

export function helloMessage(): ServerMessage {
  return { type: 'hello', protocol: PROTOCOL_VERSION, server: 'echotrail-bridge' };
}

/**
 * The state as a client starting now needs it. Detections waiting in the scan batch are left
 * out: the next scan brings them to every client, this one included. (Updates need no such
 * care: clients skip an update not newer than the track's last point.)
 */
export function buildSnapshot(p: SnapshotParts): SnapshotMessage {
  const s = p.state;
  const pending = p.batch.pendingDetections();
  const paths = s.commandedPaths;
  const history = p.comparisonHistory;
  return {
    type: 'snapshot',
    seq: p.batch.nextSeq,
    timeS: s.timeS,
    source: p.source,
    tracks: s.tracks(),
    history: s.history(),
    detections: pending.size ? s.recentDetections().filter((d) => !pending.has(d)) : s.recentDetections(),
    fixedEchoes: s.fixedEchoes,
    commanded: s.commanded,
    // Several paths, or one named after its positioner: the client needs the names.
    ...(paths.length > 1 || (paths.length === 1 && paths[0].target !== '') ? { commandedPaths: paths } : {}),
    ...(s.commandedFrom ? { commandedFrom: s.commandedFrom } : {}),
    ...(history.length ? { comparisonHistory: history } : {}),
    replay: p.replay,
  };
}
