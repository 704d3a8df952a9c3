import { mkdtemp, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { correctDetection, defaultBenchConfig, positionerToRadarFrame, loadBenchConfig, parseBenchConfig, saveBenchConfig, trackerCorrections, withCalibration } from '../../bridge/calibrate/bench-config.ts';
import { resolveMeasurementOptions, toMeasurement } from '../../bridge/tracking/measurement.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { hasCode } from '../../bridge/errors.ts';

const record = { kind: 'offsets' as const, dateUtc: '2026-12-02T02:00:00.000Z', measuredBy: 'test', method: 'unit test', result: { rangeOffsetM: 0.1 } };

describe('bench config', () => {
  it('saves and loads, validated, with history', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-bench-'));
    const path = join(dir, 'bench.json');
    const c0 = defaultBenchConfig('bay 3', new Date('2026-12-01T00:00:00Z'));
    const c1 = withCalibration(c0, { radar: { ...c0.radar, rangeOffsetM: 0.1 } }, record);
    expect(c0.history).toHaveLength(0); // input untouched
    await saveBenchConfig(path, c1);
    const back = await loadBenchConfig(path);
    expect(back).toEqual(c1);
    expect(back.updatedUtc).toBe(record.dateUtc);
    expect(JSON.parse(await readFile(path, 'utf8')).version).toBe(1);
  });

  it('a missing file is the default only when asked; bad files name the field', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-bench-'));
    expect((await loadBenchConfig(join(dir, 'none.json'), true)).radar.rangeScale).toBe(1);
    await expect(loadBenchConfig(join(dir, 'none.json'))).rejects.toThrow(/cannot read/);
    const bad = join(dir, 'bad.json');
    await writeFile(bad, JSON.stringify({ ...defaultBenchConfig(), radar: { rangeOffsetM: 0, rangeScale: -1, azimuthOffsetDeg: 0 } }));
    await expect(loadBenchConfig(bad)).rejects.toThrow(/radar\.rangeScale/);
    let err: unknown;
    try {
      parseBenchConfig({ version: 2 });
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_OPTION')).toBe(true);
  });

  it('corrections undo simulated radar errors, through the tracker\'s own conversion', () => {
    // Noise-free simulation: after correction the tracker's linearised conversion
    // (x = r·sin az, y = r·cos az) lands on the truth exactly.
    const run = simulateRun({ durationS: 5, sigmaRangeM: 0, sigmaAzimuthDeg: 0, falseAlarmRateHz: 0, pd: 1, rangeOffsetM: 0.12, azimuthOffsetDeg: 2, targets: [{ trajectory: { kind: 'static', at: { x: 1, y: 3 } } }] });
    const cfg = { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 } };
    const corr = trackerCorrections(cfg);
    const mo = resolveMeasurementOptions({ conversion: 'linearised', ...corr });
    for (const d of run.detections) {
      const m = toMeasurement(d, mo);
      expect(m.x).toBeCloseTo(1, 9);
      expect(m.y).toBeCloseTo(3, 9);
      const c = correctDetection(d, cfg);
      expect(c.rangeM).toBeCloseTo(Math.hypot(1, 3), 9);
    }
  });

  it('correctDetection divides out a range scale', () => {
    const cfg = { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.1, rangeScale: 1.01, azimuthOffsetDeg: -1 } };
    const c = correctDetection({ rangeM: 1.01 * 3 + 0.1, azimuthRad: 0 }, cfg);
    expect(c.rangeM).toBeCloseTo(3, 12);
    expect(c.azimuthRad).toBeCloseTo(Math.PI / 180, 12);
  });

  it('maps a commanded path into the radar frame as the simulator does', () => {
    const run = simulateRun({ durationS: 3, frameRotationDeg: 3, frameTranslation: { x: 0.05, y: -0.08 }, targets: [{ trajectory: { kind: 'circle', center: { x: 0, y: 3 }, radiusM: 0.5, periodS: 10 } }] });
    const cfg = { ...defaultBenchConfig(), positionerFrame: { rotationDeg: 3, translationM: { x: 0.05, y: -0.08 } } };
    const mapped = positionerToRadarFrame(run.commanded[0].points, cfg);
    mapped.forEach((p, i) => {
      expect(p.x).toBeCloseTo(run.truth[i].x, 12);
      expect(p.y).toBeCloseTo(run.truth[i].y, 12);
      expect(p.timeS).toBe(run.truth[i].timeS);
    });
  });
});
