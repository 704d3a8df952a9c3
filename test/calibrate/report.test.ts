import { describe, expect, it } from 'vitest';
import { GUIDE_STEPS, formatSummary, offsetsRecord, offsetsSummary } from '../../bridge/calibrate/report.ts';
import { fitRadarOffsets } from '../../bridge/calibrate/offsets.ts';
import { parseBenchConfig, defaultBenchConfig, withCalibration } from '../../bridge/calibrate/bench-config.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';

describe('calibration report', () => {
  const fit = fitRadarOffsets([{ x: 0.5, y: 1.5 }, { x: -1.0, y: 3.0 }, { x: 1.2, y: 4.8 }], simulateRun(builtinScenario('tape-points')).detections);

  it('summaries are in degrees at the edge', () => {
    const s = offsetsSummary(fit);
    expect(s.azimuthOffsetDeg).toBeCloseTo((fit.azimuthOffsetRad * 180) / Math.PI, 12);
    expect(s.detectionsUsed).toBe(fit.detectionsUsed);
  });

  it('history records validate inside a bench config', () => {
    const rec = offsetsRecord(fit, 'unit test', '2026-12-02T02:00:00.000Z', 3);
    expect(rec.method).toMatch(/3 tape-measured.*scale fitted/);
    expect(() => parseBenchConfig(withCalibration(defaultBenchConfig(), {}, rec))).not.toThrow();
  });

  it('formats aligned lines and gives the guide', () => {
    const text = formatSummary('title', { a: 1, bb: 0.123456789, c: 'x' });
    expect(text.split('\n')).toEqual(['title', '  a   1', '  bb  0.12346', '  c   x']);
    expect(GUIDE_STEPS.length).toBeGreaterThan(3);
  });
});
