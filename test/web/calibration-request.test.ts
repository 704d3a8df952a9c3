import { describe, expect, it } from 'vitest';
import { calibrationAnswer, frameRequest, offsetsRequest, requestDetections, spotRows, summaryRows } from '../../web/src/panels/calibration-request.ts';
import { applyMessage } from '../../web/src/stream/reduce.ts';
import { createState } from '../../web/src/stream/state.ts';

const det = (t: number) => ({ timeS: t, azimuthRad: Math.PI / 2, rangeM: 2.123456, amplitude: 3 });

describe('calibration requests', () => {
  it('sends detections in degrees, rounded', () => {
    expect(requestDetections([det(1.23456789)])).toEqual([{ timeS: 1.2346, azimuthDeg: 90, rangeM: 2.1235, amplitude: 3 }]);
  });

  it('builds an offsets request with the measured spots and who measured', () => {
    const r = offsetsRequest([{ label: 'A', x: 0.5, y: 1.5, fromS: 0, toS: 10 }], [det(1)], '  lab tech ');
    expect(r).toMatchObject({ action: 'offsets', fitScale: 'auto', measuredBy: 'lab tech', positions: [{ label: 'A', x: 0.5, y: 1.5, fromS: 0, toS: 10 }] });
    expect(r.detections).toHaveLength(1);
    expect(offsetsRequest([{ label: '', x: 0, y: 1 }], [], '')).not.toHaveProperty('measuredBy');
  });

  it('builds a frame request with the commanded path', () => {
    const r = frameRequest([det(1)], [{ timeS: 0, x: 0, y: 1 }, { timeS: 1, x: 1, y: 1 }], '');
    expect(r.action).toBe('frame');
    expect(r.commanded).toHaveLength(2);
    expect(r).not.toHaveProperty('allowCollinear');
  });

  it('asks the frame fit to accept a straight path only when the panel allows it', () => {
    const rail = [{ timeS: 0, x: -1, y: 3 }, { timeS: 10, x: 1, y: 3 }];
    expect(frameRequest([det(1)], rail, '', true)).toMatchObject({ action: 'frame', allowCollinear: true });
    expect(frameRequest([det(1)], rail, '', false)).not.toHaveProperty('allowCollinear');
  });

  it('accepts the API answers and refuses anything else', () => {
    expect(calibrationAnswer.safeParse({ ok: true, action: 'steps', steps: ['a'] }).success).toBe(true);
    expect(calibrationAnswer.safeParse({ ok: false, code: 'E_FIT', message: 'too few' }).success).toBe(true);
    expect(calibrationAnswer.safeParse({ ok: true, action: 'offsets', summary: { rangeOffsetM: 0.1 }, config: {} }).success).toBe(true);
    expect(calibrationAnswer.safeParse({ ok: true, action: 'offsets' }).success).toBe(false);
    expect(calibrationAnswer.safeParse('<html>').success).toBe(false);
  });

  it('labels summary figures with their units', () => {
    const rows = summaryRows({ rangeOffsetM: 0.1234, azimuthOffsetDeg: 2.01, rangeScale: 1.004, rangeScaleSe: 0.0012, detectionsUsed: 812, someOtherM: 1, verdict: 'consistent' });
    expect(rows).toEqual([
      { label: 'Range offset', value: '0.1234 m' },
      { label: 'Azimuth offset', value: '2.010°' },
      { label: 'Range scale', value: '1.00400 (×)' },
      { label: 'Range scale, std. error', value: '0.00120 (×)' },
      { label: 'Detections used', value: '812' },
      { label: 'some other m', value: '1.0000 m' },
      { label: 'verdict', value: 'consistent' },
    ]);
  });

  it('shows negatives with the minus sign and values that round to zero without a sign', () => {
    const rows = summaryRows({ rangeOffsetM: -0.0443, azimuthOffsetDeg: -1.5, rangeScale: 1, rotationDeg: -0.0001, translationXM: -0.00004, pairs: -2 });
    expect(rows.map((r) => r.value)).toEqual(['−0.0443 m', '−1.500°', '1.00000 (×), not fitted', '0.000°', '0.0000 m', '−2']);
    expect(rows.map((r) => r.value).join(' ')).not.toContain('-');
  });
});

describe('range scale held at 1', () => {
  it('reads "not fitted" when the fit sent no standard error for it', () => {
    expect(summaryRows({ rangeScale: 1 })).toEqual([{ label: 'Range scale', value: '1.00000 (×), not fitted' }]);
    expect(summaryRows({ rangeScale: 1.004, rangeScaleSe: 0.001 })[0]).toEqual({ label: 'Range scale', value: '1.00400 (×)' });
  });
});

describe('per-spot residual table', () => {
  it('shows mean ± std in mm and degrees with the minus sign, flags spots beyond their noise, skips malformed rows', () => {
    const rows = spotRows([
      { label: 'A', trueRangeM: 1.6, detections: 48, meanRangeResidualM: -0.0123, stdRangeResidualM: 0.0041, meanAzimuthResidualDeg: 0.034, stdAzimuthResidualDeg: 0.51, rangeBeyondNoise: false, azimuthBeyondNoise: false },
      { label: 'B', detections: 40, meanRangeResidualM: 0.0002, stdRangeResidualM: 0.004, meanAzimuthResidualDeg: -2.6, stdAzimuthResidualDeg: 0.5, rangeBeyondNoise: false, azimuthBeyondNoise: true },
      { label: 'C', detections: 'many' },
    ]);
    expect(rows).toEqual([
      { label: 'A', detections: '48', range: '−12.3 ± 4.1 mm', azimuth: '+0.03 ± 0.51°', rangeFlagged: false, azimuthFlagged: false },
      { label: 'B', detections: '40', range: '+0.2 ± 4.0 mm', azimuth: '−2.60 ± 0.50°', rangeFlagged: false, azimuthFlagged: true },
    ]);
    expect(spotRows(undefined)).toEqual([]);
  });
});

describe('calibration capture in the state', () => {
  it('collects scan detections only while active, up to the limit', () => {
    const s = createState();
    const scan = (t: number, n: number) => ({ type: 'scan' as const, timeS: t, detections: Array.from({ length: n }, () => det(t)), updates: [], deletions: [], antennaAzimuthRad: null, positioner: [] });
    applyMessage(s, scan(1, 3));
    expect(s.capture.detections).toHaveLength(0);
    s.capture.active = true;
    s.capture.limit = 5;
    applyMessage(s, scan(2, 3));
    applyMessage(s, scan(3, 3));
    expect(s.capture.detections).toHaveLength(5);
    expect(s.capture.detections.map((d) => d.timeS)).toEqual([2, 2, 2, 3, 3]);
  });
});
