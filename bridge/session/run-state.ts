/**
 * What a run looks like at one instant, accumulated record by record: the tracks alive (last
 * update per id, minus deleted ones), the latest fixed-echo map, commanded path, antenna and
 * positioner samples. Shared by the seek-index checkpoints and snapshotAt().
 */
import type { AntennaSample, Detection, FixedEcho, PositionerSample, TrackUpdate } from '../types.ts';
import type { PathPointWire } from '../server/protocol.ts';
import type { StoredRecord } from './format.ts';

/** The state of a run at `timeS`, as the dashboard's snapshot message needs it. */
export interface SessionSnapshot {
  timeS: number;
  /** Tracks alive at timeS, by id. */
  tracks: TrackUpdate[];
  /** Recent positions per alive track, flat [t0, x0, y0, t1, x1, y1, ...], oldest first. */
  history: { id: number; points: number[] }[];
  /** Detections of the last `recentDetectionsS` seconds. */
  detections: Detection[];
  fixedEchoes: FixedEcho[];
  commanded: PathPointWire[];
  antenna: AntennaSample | null;
  positioner: PositionerSample | null;
}

export class RunState {
  tracks = new Map<number, TrackUpdate>();
  fixedEchoes: FixedEcho[] = [];
  commanded: PathPointWire[] = [];
  /** Every commanded path by target ('' for a path without one), in the order they first came. */
  commandedByTarget = new Map<string, PathPointWire[]>();
  antenna: AntennaSample | null = null;
  positioner: PositionerSample | null = null;

  apply(rec: StoredRecord): void {
    switch (rec.kind) {
      case 'track': this.tracks.set(rec.update.id, rec.update); break;
      case 'deletion': this.tracks.delete(rec.deletion.id); break;
      case 'fixed-echoes': this.fixedEchoes = rec.echoes; break;
      case 'commanded':
        this.commandedByTarget.set(rec.target ?? '', rec.path);
        if (this.commandedByTarget.size === 1 || (rec.target ?? '') === [...this.commandedByTarget.keys()][0]) this.commanded = rec.path;
        break;
      case 'antenna': this.antenna = rec.sample; break;
      case 'positioner': this.positioner = rec.sample; break;
      default: break;
    }
  }

  /** A copy that later apply() calls do not change (records themselves are never mutated). */
  clone(): RunState {
    const c = new RunState();
    c.tracks = new Map(this.tracks);
    c.fixedEchoes = this.fixedEchoes;
    c.commanded = this.commanded;
    c.commandedByTarget = new Map(this.commandedByTarget);
    c.antenna = this.antenna;
    c.positioner = this.positioner;
    return c;
  }
}

/**
 * Builds a snapshot: start from `state` (valid just before the records given), apply `records`
 * up to `timeS`, keeping history and detections inside their windows.
 */
export function buildSnapshot(
  state: RunState,
  records: Iterable<{ timeS: number; record: StoredRecord }>,
  timeS: number,
  windows: { historyS: number; recentDetectionsS: number },
): SessionSnapshot {
  const s = state.clone();
  const history = new Map<number, number[]>();
  const detections: Detection[] = [];
  const historyFrom = timeS - windows.historyS;
  const detFrom = timeS - windows.recentDetectionsS;
  for (const { timeS: t, record } of records) {
    if (t > timeS) break;
    s.apply(record);
    if (record.kind === 'track' && t >= historyFrom) {
      let pts = history.get(record.update.id);
      if (!pts) history.set(record.update.id, (pts = []));
      pts.push(t, record.update.x, record.update.y);
    } else if (record.kind === 'deletion') {
      history.delete(record.deletion.id);
    } else if (record.kind === 'detection' && t >= detFrom) {
      detections.push(record.detection);
    }
  }
  const tracks = [...s.tracks.values()].sort((a, b) => a.id - b.id);
  return {
    timeS,
    tracks,
    history: tracks.filter((tr) => history.has(tr.id)).map((tr) => ({ id: tr.id, points: history.get(tr.id)! })),
    detections,
    fixedEchoes: s.fixedEchoes,
    commanded: s.commanded,
    antenna: s.antenna,
    positioner: s.positioner,
  };
}
