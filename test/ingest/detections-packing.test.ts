import { describe, expect, it } from 'vitest';
import { isDetectionsWorkerInput, isMoreMessage, packDetections, unpackDetections } from '../../bridge/ingest/detections-packing.ts';
import type { Detection } from '../../bridge/types.ts';

describe('detections across the reader thread', () => {
  it('packs and unpacks detections exactly, with and without a line number', () => {
    const dets: Detection[] = [
      { timeS: 0.125, azimuthRad: 6.2831, rangeM: 3.25, amplitude: 57.5, line: 2 },
      { timeS: 1e6, azimuthRad: 0, rangeM: 0, amplitude: 1e-6 },
    ];
    const packed = packDetections(dets);
    expect(unpackDetections(packed)).toEqual(dets);
    expect(unpackDetections(packDetections([]))).toEqual([]);
  });

  it('checks what the worker is started with and told', () => {
    expect(isDetectionsWorkerInput({ path: '/tmp/run.csv', options: {}, window: 8 })).toBe(true);
    expect(isDetectionsWorkerInput({ path: '/tmp/run.csv', options: { maxRangeM: 20, defaultAmplitude: 1, spikeS: 1 }, window: 1 })).toBe(true);
    expect(isDetectionsWorkerInput({ path: '/tmp/run.csv', options: { maxRangeM: '20' }, window: 8 })).toBe(false);
    expect(isDetectionsWorkerInput({ path: '/tmp/run.csv', options: {}, window: 0 })).toBe(false);
    expect(isDetectionsWorkerInput({ path: 7, options: {}, window: 8 })).toBe(false);
    expect(isDetectionsWorkerInput({ path: '/tmp/run.csv', window: 8 })).toBe(false);
    expect(isDetectionsWorkerInput(null)).toBe(false);
    expect(isMoreMessage({ type: 'more' })).toBe(true);
    expect(isMoreMessage({ type: 'less' })).toBe(false);
    expect(isMoreMessage(undefined)).toBe(false);
  });
});
