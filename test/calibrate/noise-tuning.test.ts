import { describe, expect, it } from 'vitest';
import { associateWithPath, tuneNoise } from '../../bridge/calibrate/noise-tuning.ts';
import { defaultBenchConfig } from '../../bridge/calibrate/bench-config.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';
import { hasCode } from '../../bridge/errors.ts';

const DEG = Math.PI / 180;

describe('tuneNoise', () => {
  const bench = { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 }, positionerFrame: { rotationDeg: 3, translationM: { x: 0.05, y: -0.08 } } };

  it('σ_range and σ_azimuth confidence intervals contain the simulated values', () => {
    // offsets-check simulates σ_r = 5 cm, σ_az = 1.5° (the simulator's defaults); the 95% χ²
    // interval (Papoulis & Pillai §7-4, from memory) must cover them. A longer run tightens it.
    const run = simulateRun({ ...builtinScenario('offsets-check'), durationS: 300, seed: 8, sigmaRangeM: 0.04, sigmaAzimuthDeg: 1.2 });
    const r = tuneNoise(run.detections, run.commanded[0].points, bench);
    expect(r.samples).toBeGreaterThan(250);
    expect(r.sigmaRangeCiM[0]).toBeLessThan(0.04);
    expect(r.sigmaRangeCiM[1]).toBeGreaterThan(0.04);
    expect(r.sigmaAzimuthCiRad[0]).toBeLessThan(1.2 * DEG);
    expect(r.sigmaAzimuthCiRad[1]).toBeGreaterThan(1.2 * DEG);
    expect(Math.abs(r.rangeBiasM)).toBeLessThan((4 * 0.04) / Math.sqrt(r.samples));
  });

  it('the tuned process noise makes the NIS consistent, for kalman and imm', () => {
    const run = simulateRun({ ...builtinScenario('offsets-check'), durationS: 240, seed: 9 });
    for (const filter of ['kalman', 'imm'] as const) {
      const r = tuneNoise(run.detections, run.commanded[0].points, bench, { filter });
      expect(r.bracketed).toBe(true);
      expect(r.nisTuned.mean).toBeCloseTo(2, 2);
      expect(r.nisTuned.verdict).toBe('consistent');
      expect(r.filter.kind).toBe(filter);
    }
  });

  it('leaves out a rail mount next to where the carriage dwells (it would count as noise)', () => {
    // rail-sweep: the west rail mount sits 0.3 m from a dwell point, inside the 0.4 m gate. The
    // simulated noise is σ_r = 5 cm, σ_az = 1.5°; with the mount taken in, both came out about
    // twice as large and their 95 % intervals (Papoulis & Pillai §7-4, from memory) excluded
    // the truth.
    const run = simulateRun({ ...builtinScenario('rail-sweep'), seed: 4 });
    const cfg = defaultBenchConfig();
    const kept = tuneNoise(run.detections, run.commanded[0].points, cfg, { skipFixedEchoes: false });
    expect(kept.onFixedEchoes).toBe(0);
    expect(kept.sigmaRangeCiM[0]).toBeGreaterThan(0.05);
    const r = tuneNoise(run.detections, run.commanded[0].points, cfg);
    expect(r.onFixedEchoes).toBeGreaterThan(10);
    expect(r.fixedEchoes).toBeGreaterThan(0);
    expect(r.sigmaRangeCiM[0]).toBeLessThan(0.05);
    expect(r.sigmaRangeCiM[1]).toBeGreaterThan(0.05);
    expect(r.sigmaAzimuthCiRad[0]).toBeLessThan(1.5 * DEG);
    expect(r.sigmaAzimuthCiRad[1]).toBeGreaterThan(1.5 * DEG);
  });

  it('a manoeuvring run needs more process noise than a gentle one', () => {
    // brake-reverse brakes at 0.8 m/s² and reverses; the turntable glides. Same antenna period
    // (0.5 s) and noise, so only the motion differs.
    const gentle = simulateRun({ ...builtinScenario('turntable'), seed: 2 });
    const hard = simulateRun({ ...builtinScenario('brake-reverse'), durationS: 25, seed: 2 });
    const cfg = defaultBenchConfig();
    const g = tuneNoise(gentle.detections, gentle.commanded[0].points, cfg);
    const h = tuneNoise(hard.detections, hard.commanded[0].points, cfg, { minSamples: 20 });
    expect(h.filter.sigmaAccel!).toBeGreaterThan(g.filter.sigmaAccel!);
  });

  it('a wrong frame finds no detections near the path: clear message', () => {
    const run = simulateRun({ ...builtinScenario('offsets-check'), durationS: 60 });
    const wrong = { ...bench, positionerFrame: { rotationDeg: 0, translationM: { x: 2, y: 2 } } };
    let err: unknown;
    try {
      tuneNoise(run.detections, run.commanded[0].points, wrong);
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
    expect((err as Error).message).toMatch(/frame calibration/);
    expect(associateWithPath(run.detections, run.commanded[0].points, wrong, 0.4).length).toBeLessThan(30);
  });
});
