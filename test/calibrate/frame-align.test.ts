import { describe, expect, it } from 'vitest';
import { alignFrame } from '../../bridge/calibrate/frame-align.ts';
import { correctDetection, defaultBenchConfig, type BenchConfig } from '../../bridge/calibrate/bench-config.ts';
import { fitRadarOffsets } from '../../bridge/calibrate/offsets.ts';
import { simulateRun, type SimulatedRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';
import { hasCode } from '../../bridge/errors.ts';

const DEG = Math.PI / 180;

function observed(run: SimulatedRun, config: BenchConfig) {
  return run.detections.map((d) => correctDetection(d, config)).map((d) => ({ timeS: d.timeS, x: d.rangeM * Math.sin(d.azimuthRad), y: d.rangeM * Math.cos(d.azimuthRad) }));
}

const identity = { rotationRad: 0, translation: { x: 0, y: 0 } };

describe('alignFrame on a simulated bench', () => {
  // offsets-check: range +0.12 m, azimuth +2°, positioner frame turned 3°, shifted (5, −8) cm.
  const known = { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 } };

  it('recovers rotation and translation within 3 reported standard errors (offsets known)', () => {
    const run = simulateRun(builtinScenario('offsets-check'));
    const fit = alignFrame(observed(run, known), run.commanded[0].points, { initial: identity });
    expect(Math.abs(fit.rotationRad - 3 * DEG)).toBeLessThan(3 * fit.rotationSeRad);
    expect(Math.abs(fit.translation.x - 0.05)).toBeLessThan(3 * fit.translationSe.x);
    expect(Math.abs(fit.translation.y + 0.08)).toBeLessThan(3 * fit.translationSe.y);
    // the wall, mounts and clutter are gated out: about one detection per revolution is kept
    expect(fit.used).toBeLessThan(130);
    expect(fit.used).toBeGreaterThan(90);
  });

  it('finds a badly misaligned frame from detections by voting, then fits it within 3σ', () => {
    const run = simulateRun({ ...builtinScenario('offsets-check'), frameRotationDeg: 40, frameTranslation: { x: 0.6, y: -0.4 } });
    const fit = alignFrame(observed(run, known), run.commanded[0].points, { initial: identity });
    expect(Math.abs(fit.rotationRad - 40 * DEG)).toBeLessThan(3 * fit.rotationSeRad);
    expect(Math.abs(fit.translation.x - 0.6)).toBeLessThan(3 * fit.translationSe.x);
    expect(Math.abs(fit.translation.y + 0.4)).toBeLessThan(3 * fit.translationSe.y);
  });

  it('the rotation error is honest: z-scores over 12 seeds have unit spread', () => {
    // (estimate − truth)/se ~ N(0,1) when the se is right; sample RMS of 12 values lies in
    // [0.5, 1.5] with probability ≈ 0.95 (χ²(12), common practice).
    const z: number[] = [];
    for (let seed = 40; seed < 52; seed++) {
      const run = simulateRun({ ...builtinScenario('offsets-check'), seed });
      const fit = alignFrame(observed(run, known), run.commanded[0].points, { initial: identity });
      z.push((fit.rotationRad - 3 * DEG) / fit.rotationSeRad);
    }
    const rms = Math.sqrt(z.reduce((a, b) => a + b * b, 0) / z.length);
    expect(rms).toBeGreaterThan(0.5);
    expect(rms).toBeLessThan(1.5);
  });

  it('chain: offsets from the tape-measured reflectors, then the frame, each within 3σ', () => {
    const tape = simulateRun(builtinScenario('tape-points'));
    const off = fitRadarOffsets([{ x: 0.5, y: 1.5 }, { x: -1.0, y: 3.0 }, { x: 1.2, y: 4.8 }], tape.detections, { fitScale: false });
    // tape-points has a 1.004 range scale; fitted as offset only, the offset absorbs ≈ 0.004·r̄.
    expect(Math.abs(off.azimuthOffsetRad - 2 * DEG)).toBeLessThan(3 * off.azimuthOffsetSeRad);
    const cfg = { ...defaultBenchConfig(), radar: { rangeOffsetM: off.rangeOffsetM, rangeScale: 1, azimuthOffsetDeg: off.azimuthOffsetRad / DEG } };
    const run = simulateRun({ ...builtinScenario('offsets-check'), seed: 3 });
    const fit = alignFrame(observed(run, cfg), run.commanded[0].points, { initial: identity });
    // The azimuth-offset error turns the whole picture, so it adds to the rotation's uncertainty.
    const se = Math.hypot(fit.rotationSeRad, off.azimuthOffsetSeRad);
    expect(Math.abs(fit.rotationRad - 3 * DEG)).toBeLessThan(3 * se);
  });

  it('uses a track without gating, and refuses runs that do not overlap', () => {
    const run = simulateRun(builtinScenario('offsets-check'));
    const truthTrack = run.truth.map((s) => ({ timeS: s.timeS, x: s.x, y: s.y }));
    const fit = alignFrame(truthTrack, run.commanded[0].points);
    expect(fit.rotationRad).toBeCloseTo(3 * DEG, 9);
    expect(fit.translation.x).toBeCloseTo(0.05, 9);
    let err: unknown;
    try {
      alignFrame(truthTrack.map((p) => ({ ...p, timeS: p.timeS + 1000 })), run.commanded[0].points);
    } catch (e) {
      err = e;
    }
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
    expect((err as Error).message).toMatch(/same run/);
  });

  it('a straight rail run is refused unless allowed', () => {
    const run = simulateRun({ ...builtinScenario('rail-sweep'), durationS: 60, frameRotationDeg: 2 });
    const obs = observed(run, defaultBenchConfig());
    expect(() => alignFrame(obs, run.commanded[0].points, { initial: identity })).toThrow(/straight line/);
    const fit = alignFrame(obs, run.commanded[0].points, { initial: identity, allowCollinear: true });
    expect(Math.abs(fit.rotationRad - 2 * DEG)).toBeLessThan(3 * fit.rotationSeRad);
  });
});
