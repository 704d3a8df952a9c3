import { describe, expect, it } from 'vitest';
import {
  CaptureWatch, calibrationAnswer, captureJumpNote, captureProblem, captureSpans, emptySpot, frameRequest, offsetsProblem, offsetsRequest,
  requestDetections, spotRows, summaryRows,
} from '../../web/src/panels/calibration-request.ts';
import { MIN_REVOLUTIONS_PER_SPOT } from '../../bridge/calibrate/guide.ts';
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
    // An unnamed spot goes by its placeholder; cleared time inputs (null) are not sent.
    expect(offsetsRequest([{ label: 'A', x: 1, y: 2 }, { label: ' ', x: 0, y: 1, fromS: null, toS: 12 }], [], '').positions).toEqual([{ label: 'A', x: 1, y: 2 }, { label: 'spot 2', x: 0, y: 1, toS: 12 }]);
  });

  it('refuses to fit spots whose x or y are not entered, naming them, and a capture shorter than the guide asks', () => {
    const enough = MIN_REVOLUTIONS_PER_SPOT;
    // A new row is empty: nothing to fit to, where the old pre-filled row fitted a spot that was not there.
    expect(emptySpot()).toEqual({ label: '', x: null, y: null });
    expect(offsetsProblem([emptySpot()], 900)).toBe('spot 1: enter its tape-measured x and y (metres) before fitting');
    expect(offsetsProblem([{ label: 'door', x: 1, y: 2 }, { label: 'wall', x: 0.5, y: undefined }], 900)).toBe('wall: enter its tape-measured y (metres) before fitting');
    expect(offsetsProblem([{ label: '', x: 0, y: 2 }, { label: '', x: Number.NaN, y: 3 }], 900)).toBe('spot 2: enter its tape-measured x (metres) before fitting');
    expect(offsetsProblem([{ label: 'A', x: 0, y: 2 }], enough - 14)).toBe(`the capture holds 6 detections; the guide asks for at least ${enough} revolutions (or 10 s staring) per spot: capture longer`);
    expect(offsetsProblem([{ label: 'A', x: 0, y: 2 }], enough)).toBeNull();
    expect(offsetsProblem([], 900)).toMatch(/add a tape-measured spot/);
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
  it('shows mean ± std in mm and degrees with the minus sign, the leave-one-out figures and verdicts, skips malformed rows', () => {
    const rows = spotRows([
      { label: 'A', trueRangeM: 1.6, detections: 48, meanRangeResidualM: -0.0123, stdRangeResidualM: 0.0041, meanAzimuthResidualDeg: 0.034, stdAzimuthResidualDeg: 0.51,
        deletedRangeResidualM: -0.0211, deletedRangeSdM: 0.0152, deletedAzimuthResidualDeg: 0.05, deletedAzimuthSdDeg: 0.31, rangeVerdict: 'consistent', azimuthVerdict: 'consistent', rangeBeyondNoise: false, azimuthBeyondNoise: false },
      { label: 'B', detections: 40, meanRangeResidualM: 0.0002, stdRangeResidualM: 0.004, meanAzimuthResidualDeg: -2.6, stdAzimuthResidualDeg: 0.5,
        deletedAzimuthResidualDeg: -3.92, deletedAzimuthSdDeg: 0.37, rangeVerdict: 'disagree', azimuthVerdict: 'inconsistent', rangeBeyondNoise: false, azimuthBeyondNoise: true },
      { label: 'C', detections: 'many' },
    ]);
    expect(rows).toEqual([
      { label: 'A', detections: '48', range: '−12.3 ± 4.1 mm', azimuth: '+0.03 ± 0.51°', rangeVsOthers: '−21.1 ± 15.2 mm', azimuthVsOthers: '+0.05 ± 0.31°',
        rangeFlagged: false, azimuthFlagged: false, rangeDisputed: false, azimuthDisputed: false },
      { label: 'B', detections: '40', range: '+0.2 ± 4.0 mm', azimuth: '−2.60 ± 0.50°', rangeVsOthers: '—', azimuthVsOthers: '−3.92 ± 0.37°',
        rangeFlagged: false, azimuthFlagged: true, rangeDisputed: true, azimuthDisputed: false },
    ]);
    expect(spotRows(undefined)).toEqual([]);
    // A bridge without verdicts: its flags are shown as they are.
    expect(spotRows([{ label: 'D', detections: 9, meanRangeResidualM: 0, stdRangeResidualM: 0, meanAzimuthResidualDeg: 0, stdAzimuthResidualDeg: 0, rangeBeyondNoise: true }])[0])
      .toMatchObject({ rangeFlagged: true, rangeDisputed: false, rangeVsOthers: '—' });
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

describe('capture across a replay jump', () => {
  const scan = (t: number, n = 3) => ({ type: 'scan' as const, timeS: t, detections: Array.from({ length: n }, (_, k) => det(t + k * 0.01)), updates: [], deletions: [], antennaAzimuthRad: null, positioner: [] });

  it('stops at a loop restart and keeps the pass before it', () => {
    const s = createState();
    const watch = new CaptureWatch();
    s.capture.active = true;
    watch.start(0, s.epoch);
    for (let k = 0; k <= 36; k++) applyMessage(s, scan(Number((0.4 + 0.5 * k).toFixed(1))));
    expect(watch.look(s.capture.detections, s.epoch)).toBeNull();
    const before = s.capture.detections.length;
    // The session ends and starts over: the stream restarts the picture and goes on capturing.
    applyMessage(s, scan(1.1));
    applyMessage(s, scan(1.6));
    const jump = watch.look(s.capture.detections, s.epoch)!;
    expect(jump).toMatchObject({ index: before, toS: 1.1 });
    expect(jump.fromS).toBeCloseTo(18.42, 9);
    expect(captureJumpNote(jump, jump.index)).toBe(`capture stopped: the replay jumped back from 18.4 s to 1.1 s; kept the ${before} detections captured before the jump. Fit them, or Clear and capture again`);
    s.capture.detections.length = jump.index;
    watch.truncated(jump.index);
    expect(captureSpans(s.capture.detections, watch.runs)).toEqual([{ fromS: 0.4, toS: jump.fromS, count: before }]);
  });

  it('stops at a seek forward (the picture restarted, then a leap), not at a quiet spell', () => {
    const watch = new CaptureWatch();
    const dets = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 3.0, 3.1].map(det);
    watch.start(0, 4);
    // 0.6 → 3.0 s with no restart: nothing was detected for a while; the capture goes on.
    expect(watch.look(dets, 4)).toBeNull();
    dets.push(det(3.2), det(3.3));
    expect(watch.look(dets, 4)).toBeNull();
    // A seek: the snapshot restarts the picture (epoch), its scans come in the next frame.
    expect(watch.look(dets, 5)).toBeNull();
    dets.push(det(3.4), det(40.2), det(40.3));
    expect(watch.look(dets, 5)).toEqual({ index: 12, fromS: 3.4, toS: 40.2 });
  });

  it('stops at a step back of one revolution, where the replay starts again on the detection captured last', () => {
    // One reflector, 1 s antenna: one detection a revolution. Stepping back one revolution from
    // 5.0 s replays the 4.3 s detection again: the same time, not a step back beyond the tolerance.
    const watch = new CaptureWatch();
    const dets = [0.3, 1.3, 2.3, 3.3, 4.3].map(det);
    watch.start(0, 1);
    expect(watch.look(dets, 1)).toBeNull();
    dets.push(det(4.3), det(5.3));
    const jump = watch.look(dets, 2)!;
    expect(jump).toEqual({ index: 5, fromS: 4.3, toS: 4.3 });
    expect(captureJumpNote(jump, 5)).toMatch(/^capture stopped: the replay jumped back from 4\.3 s to 4\.3 s/);
  });

  it('compares only within a capture run; runs over the same run time cannot be fitted', () => {
    const watch = new CaptureWatch();
    const dets = [10, 11, 12].map(det);
    watch.start(0, 1);
    expect(watch.look(dets, 1)).toBeNull();
    // Stopped, taken back to 2 s, started again: the user's doing, not a jump.
    watch.start(dets.length, 2);
    dets.push(det(2), det(3));
    expect(watch.look(dets, 2)).toBeNull();
    const spans = captureSpans(dets, watch.runs);
    expect(spans).toEqual([{ fromS: 10, toS: 12, count: 3 }, { fromS: 2, toS: 3, count: 2 }]);
    expect(captureProblem(spans)).toBeNull();
    dets.push(det(10.5));
    expect(captureProblem(captureSpans(dets, watch.runs))).toBe('the capture holds two passes over the same run time (2.0 s – 10.5 s and 10.0 s – 12.0 s): Clear and capture one pass');
  });
});

