import { describe, expect, it } from 'vitest';
import { isTracksWorkerCommand, isTracksWorkerInput, packUpdate, unpackUpdate, UPDATE_FIELDS } from '../../bridge/tracking/tracks-packing.ts';
import type { Measurement, TrackUpdate } from '../../bridge/types.ts';

const update = (over: Partial<TrackUpdate> = {}): TrackUpdate => ({
  timeS: 12.5, id: 7, status: 'coasting', x: -1.25, y: 3.5, vx: 0.1, vy: -0.2, speed: Math.hypot(0.1, 0.2), headingRad: 2.6779,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.8, moving: true, hits: 12, misses: 1,
  measurement: { timeS: 12.49, x: -1.2, y: 3.45, rxx: 0.0025, rxy: 0.0001, ryy: 0.004 }, nis: 1.75, ...over,
});

describe('track updates across the writer thread', () => {
  it('packs and unpacks every field the CSV row writes, a coast without its measurement', () => {
    const a = new Float64Array(2 * UPDATE_FIELDS);
    const hit = update();
    const coast = update({ status: 'confirmed', measurement: undefined, nis: undefined });
    packUpdate(a, 0, hit);
    packUpdate(a, UPDATE_FIELDS, coast);
    const row = {} as TrackUpdate;
    const m = {} as Measurement;
    unpackUpdate(a, 0, row, m);
    const { pxx, pxy, pyy, moving, hits, misses, ...written } = hit;
    void [pxx, pxy, pyy, moving, hits, misses];
    expect(row).toEqual(written);
    unpackUpdate(a, UPDATE_FIELDS, row, m);
    expect(row.measurement).toBeUndefined();
    expect(row.nis).toBeUndefined();
    expect(row.status).toBe('confirmed');
  });

  it('checks what the writer is started with and sent', () => {
    expect(isTracksWorkerInput({ path: '/tmp/.tracks.csv.tmp', shownPath: 'tracks.csv' })).toBe(true);
    expect(isTracksWorkerInput({ path: '', shownPath: 'tracks.csv' })).toBe(false);
    expect(isTracksWorkerInput({ path: '/tmp/x' })).toBe(false);
    expect(isTracksWorkerCommand({ type: 'end' })).toBe(true);
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS), count: 1 })).toBe(true);
    // More rows claimed than the array holds, a fraction, the wrong array type.
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS), count: 2 })).toBe(false);
    expect(isTracksWorkerCommand({ type: 'rows', rows: new Float64Array(UPDATE_FIELDS), count: 0.5 })).toBe(false);
    expect(isTracksWorkerCommand({ type: 'rows', rows: [1, 2], count: 0 })).toBe(false);
  });
});
