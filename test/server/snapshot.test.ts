import { describe, expect, it } from 'vitest';
import { buildSnapshot, helloMessage, type SnapshotParts } from '../../bridge/server/snapshot.ts';
import { LiveState } from '../../bridge/server/state.ts';
import { ScanBatch } from '../../bridge/server/scan-batch.ts';
import { SourceStats } from '../../bridge/server/source-stats.ts';
import { serverMessage } from '../../bridge/server/protocol.ts';
import { trackAt } from '../helpers/scripted-source.ts';

function parts(o: Partial<Omit<SnapshotParts, 'batch'>> = {}): SnapshotParts & { batch: ScanBatch } {
  const batch = new ScanBatch({ rateHz: 10, maxDetections: 100, emit: () => undefined });
  batch.hold();
  return { state: new LiveState(), source: new SourceStats(() => 0).status(), comparisonHistory: [], replay: null, ...o, batch };
}

describe('snapshot', () => {
  it('greets with the protocol version', () => {
    expect(serverMessage.parse(helloMessage())).toEqual({ type: 'hello', protocol: 1, server: 'echotrail-bridge' });
  });

  it('leaves out the detections the next scan brings, and carries its sequence number', () => {
    const p = parts();
    const d = (t: number) => ({ timeS: t, azimuthRad: 0, rangeM: 10, amplitude: 1 });
    p.state.addDetection(d(1));
    p.batch.detection(p.state.addDetection(d(1.5)), 0);
    p.state.addUpdate(trackAt(3, 1.5, 1, 2));
    const s = buildSnapshot(p);
    expect(serverMessage.parse(s)).toBeTruthy();
    expect(s.seq).toBe(p.batch.nextSeq);
    expect(s.timeS).toBe(1.5);
    expect(s.detections.map((x) => x.timeS)).toEqual([1]);
    expect(s.tracks.map((t) => t.id)).toEqual([3]);
    expect(s.history.map((h) => h.id)).toEqual([3]);
    p.batch.close();
  });

  it('names the commanded paths only when there are several or one is named, and says where they come from', () => {
    const one = parts();
    one.state.setCommanded([{ timeS: 0, x: 0, y: 0 }]);
    const s1 = buildSnapshot(one);
    expect(s1.commandedPaths).toBeUndefined();
    expect(s1.commanded).toHaveLength(1);
    expect(s1.commandedFrom).toBe('whole');
    const named = parts();
    named.state.addPositioner({ timeS: 0, cmdX: 1, cmdY: 1, target: 'carriage-a' });
    const s2 = buildSnapshot(named);
    expect(s2.commandedPaths?.map((p) => p.target)).toEqual(['carriage-a']);
    expect(s2.commandedFrom).toBe('positioner');
    const none = buildSnapshot(parts());
    expect('commandedFrom' in none).toBe(false);
    one.batch.close();
    named.batch.close();
  });

  it('carries the comparison history and the replay state only when there are some', () => {
    const empty = buildSnapshot(parts());
    expect('comparisonHistory' in empty).toBe(false);
    expect(empty.replay).toBeNull();
    const replay = { sessionId: 's', durationS: 10, positionS: 2, speed: 1, playing: false, loop: false };
    const full = buildSnapshot(parts({ comparisonHistory: [{ pathId: 'commanded', points: [1, 0.2] }], replay }));
    expect(full.comparisonHistory).toEqual([{ pathId: 'commanded', points: [1, 0.2] }]);
    expect(full.replay).toEqual(replay);
    expect(serverMessage.parse(full)).toBeTruthy();
  });
});
