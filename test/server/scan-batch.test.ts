import { describe, expect, it } from 'vitest';
import { ScanBatch, type ScanMessage } from '../../bridge/server/scan-batch.ts';
import { toTrackWire } from '../../bridge/server/state.ts';
import { trackAt } from '../helpers/scripted-source.ts';

function batch(rateHz = 1000, maxDetections = 1000): { b: ScanBatch; out: { scan: ScanMessage; arrivals: number[] }[] } {
  const out: { scan: ScanMessage; arrivals: number[] }[] = [];
  return { b: new ScanBatch({ rateHz, maxDetections, emit: (scan, arrivals) => out.push({ scan, arrivals }) }), out };
}

describe('ScanBatch', () => {
  it('sends the first increment after a quiet spell at once and merges the rest into the next slot', async () => {
    const { b, out } = batch(20);
    b.update(toTrackWire(trackAt(1, 0.0, 0, 0)), 5);
    b.schedule();
    expect(out).toHaveLength(1);
    b.update(toTrackWire(trackAt(1, 0.1, 0, 0)), 6);
    b.schedule();
    b.update(toTrackWire(trackAt(2, 0.2, 0, 0)), 7);
    b.schedule();
    expect(out).toHaveLength(1);
    await new Promise((r) => setTimeout(r, 80));
    expect(out).toHaveLength(2);
    expect(out[1].scan.updates.map((u) => [u.id, u.timeS])).toEqual([[1, 0.1], [2, 0.2]]);
    expect(out[1].arrivals).toEqual([6, 7]);
    expect(out.map((o) => o.scan.seq)).toEqual([0, 1]);
    b.close();
  });

  it('caps the detections of one scan, keeping the newest', () => {
    const { b, out } = batch(1000, 3);
    for (let i = 0; i < 10; i++) b.detection({ timeS: i, azimuthRad: 0, rangeM: 1, amplitude: 1 }, i);
    b.flush();
    expect(out[0].scan.detections.map((d) => d.timeS)).toEqual([7, 8, 9]);
    expect(out[0].scan.timeS).toBe(9);
  });

  it('keeps updates and the deletion of a track in the same scan, and sends nothing while held', () => {
    const { b, out } = batch();
    b.hold();
    b.update(toTrackWire(trackAt(5, 1, 0, 0)));
    b.deletion({ timeS: 1.1, id: 5, reason: 'misses' });
    b.schedule();
    b.flush();
    expect(out).toHaveLength(0);
    b.release();
    b.flush();
    expect(out[0].scan.updates.map((u) => u.id)).toEqual([5]);
    expect(out[0].scan.deletions.map((d) => d.id)).toEqual([5]);
    b.antennaAzimuth(1.25);
    b.discard();
    b.flush();
    expect(out).toHaveLength(1);
  });

  it('beyond the cap keeps the latest update of each track only, in order of last appearance', () => {
    const { b, out } = batch(1000, 4);
    for (let i = 0; i < 6; i++) b.update(toTrackWire(trackAt(1 + (i % 3), i, i, 0)));
    b.flush();
    expect(out[0].scan.updates.map((u) => [u.id, u.timeS])).toEqual([[1, 3], [2, 4], [3, 5]]);
  });

  it('after discard (seek, loop, new source) the next scan carries the new position\'s time, not the highest seen', () => {
    const { b, out } = batch();
    b.update(toTrackWire(trackAt(1, 59, 0, 0)));
    b.flush();
    expect(out[0].scan.timeS).toBe(59);
    b.discard();
    b.update(toTrackWire(trackAt(2, 10.2, 0, 0)));
    b.flush();
    expect(out[1].scan.timeS).toBe(10.2);
  });
});
