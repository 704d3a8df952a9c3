import { describe, expect, it } from 'vitest';
import chisqQuantile from '@stdlib/stats-base-dists-chisquare-quantile';
import { iterateRun, simulateRun, targetStateAt } from '../../bridge/sim/run.ts';
import { beamAzimuth } from '../../bridge/sim/antenna.ts';
import { wrapPi } from '../../bridge/sim/measure.ts';
import { resolveScenarioOptions, type ScenarioOptions } from '../../bridge/sim/scenario.ts';

const DEG = Math.PI / 180;

/** Two-sided 99.9% interval of the sample variance of n Gaussian values with std σ. */
function varianceBounds(n: number, sigma: number): [number, number] {
  // (n−1)s²/σ² ~ χ²(n−1) (Papoulis & Pillai, Probability, Random Variables and Stochastic
  // Processes, 4th ed., §7-4, sample variance; section from memory).
  return [(chisqQuantile(0.0005, n - 1) * sigma * sigma) / (n - 1), (chisqQuantile(0.9995, n - 1) * sigma * sigma) / (n - 1)];
}

function variance(xs: number[]): number {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1);
}

const staticBench: ScenarioOptions = {
  durationS: 600,
  seed: 21,
  sigmaRangeM: 0.04,
  sigmaAzimuthDeg: 1.2,
  pd: 0.85,
  falseAlarmRateHz: 2,
  rangeOffsetM: 0.1,
  rangeScale: 1.01,
  azimuthOffsetDeg: -2.5,
  targets: [{ trajectory: { kind: 'static', at: { x: 1, y: 3 } } }, { trajectory: { kind: 'circle', center: { x: -1, y: 3 }, radiusM: 0.5, periodS: 17 } }],
};

describe('simulateRun statistics', () => {
  const run = simulateRun(staticBench);
  const sc = run.scenario;
  const targetDets = run.detections.map((d, i) => ({ d, o: run.origins[i] })).filter((e) => e.o.kind === 'target');

  it('range noise: residual variance inside the χ² bound, mean at the simulated offset', () => {
    const res = targetDets.map(({ d, o }) => d.rangeM - (sc.rangeScale * (o as { trueRangeM: number }).trueRangeM + sc.rangeOffsetM));
    const [lo, hi] = varianceBounds(res.length, 0.04);
    const v = variance(res);
    expect(v).toBeGreaterThan(lo);
    expect(v).toBeLessThan(hi);
    expect(Math.abs(res.reduce((a, b) => a + b, 0) / res.length)).toBeLessThan((4 * 0.04) / Math.sqrt(res.length));
  });

  it('azimuth noise: residual variance inside the χ² bound, mean at the simulated offset', () => {
    const res = targetDets.map(({ d, o }) => wrapPi(d.azimuthRad - (o as { trueAzimuthRad: number }).trueAzimuthRad - sc.azimuthOffsetRad));
    const s = 1.2 * DEG;
    const [lo, hi] = varianceBounds(res.length, s);
    expect(variance(res)).toBeGreaterThan(lo);
    expect(variance(res)).toBeLessThan(hi);
    expect(Math.abs(res.reduce((a, b) => a + b, 0) / res.length)).toBeLessThan((4 * s) / Math.sqrt(res.length));
  });

  it('P_D: detections per look are binomial(n, p) within 4σ', () => {
    // Binomial mean np, variance np(1−p) (Papoulis & Pillai, ch. 4; from memory).
    const looks = 600; // one per revolution of the 1 s antenna, per target
    for (const id of [1, 2]) {
      const hits = targetDets.filter((e) => e.o.kind === 'target' && e.o.targetId === id).length;
      expect(Math.abs(hits - looks * 0.85)).toBeLessThan(4 * Math.sqrt(looks * 0.85 * 0.15));
    }
  });

  it('false alarms: Poisson count with mean rate·duration within 4σ, uniform in range', () => {
    // Poisson mean = variance = λT (Papoulis & Pillai, ch. 4; from memory).
    const fa = run.detections.filter((_, i) => run.origins[i].kind === 'false-alarm');
    const mean = 2 * 600;
    expect(Math.abs(fa.length - mean)).toBeLessThan(4 * Math.sqrt(mean));
    // Uniform on [0.3, 8]: mean 4.15, std (8 − 0.3)/√12 (common practice).
    const mr = fa.reduce((a, d) => a + d.rangeM, 0) / fa.length;
    expect(Math.abs(mr - 4.15)).toBeLessThan((4 * (7.7 / Math.sqrt(12))) / Math.sqrt(fa.length));
    for (const d of fa) expect(d.amplitude).toBeGreaterThan(0);
  });

  it('detections are in time order, azimuths in [0, 2π), amplitudes positive', () => {
    for (let i = 1; i < run.detections.length; i++) expect(run.detections[i].timeS).toBeGreaterThanOrEqual(run.detections[i - 1].timeS);
    for (const d of run.detections) {
      expect(d.azimuthRad >= 0 && d.azimuthRad < 2 * Math.PI).toBe(true);
      expect(d.amplitude).toBeGreaterThan(0);
      expect(d.timeS).toBeLessThanOrEqual(600);
    }
  });

  it('a rotating antenna detects a target when the beam points at it', () => {
    for (const { d, o } of targetDets.slice(0, 200)) {
      if (o.kind !== 'target') continue;
      expect(Math.abs(wrapPi(beamAzimuth(1, 0, d.timeS) - o.trueAzimuthRad))).toBeLessThan(1e-6);
    }
  });
});

describe('simulateRun outputs', () => {
  it('is reproducible per seed and iterateRun yields the same records', () => {
    const a = simulateRun({ ...staticBench, durationS: 30 });
    const b = simulateRun({ ...staticBench, durationS: 30 });
    expect(b.detections).toEqual(a.detections);
    const c = simulateRun({ ...staticBench, durationS: 30, seed: 22 });
    expect(c.detections).not.toEqual(a.detections);
    const streamed = [...iterateRun({ ...staticBench, durationS: 30 })].filter((r) => r.kind === 'detection').map((r) => (r.kind === 'detection' ? r.detection : null));
    expect(streamed).toEqual(a.detections);
  });

  it('truth is in the radar frame, commanded in the positioner frame', () => {
    const opts: ScenarioOptions = { durationS: 10, frameRotationDeg: 90, frameTranslation: { x: 0.5, y: 1 }, targets: [{ trajectory: { kind: 'static', at: { x: 2, y: 0 } } }] };
    const run = simulateRun(opts);
    expect(run.truth).toHaveLength(101); // 10 Hz, 0…10 s inclusive
    expect(run.commanded[0].points[5]).toEqual({ timeS: 0.5, x: 2, y: 0 });
    expect(run.truth[5].x).toBeCloseTo(0.5, 12); // R(90°)·(2, 0) + (0.5, 1) = (0.5, 3)
    expect(run.truth[5].y).toBeCloseTo(3, 12);
    const s = targetStateAt(resolveScenarioOptions(opts), 0, 3);
    expect(s.y).toBeCloseTo(3, 12);
  });

  it('a staring antenna gives rate·duration·P_D looks, only inside its sector', () => {
    const run = simulateRun({
      durationS: 4, pd: 1, falseAlarmRateHz: 0,
      antenna: { mode: 'staring', rateHz: 250, sectorDeg: 40 },
      targets: [{ trajectory: { kind: 'static', at: { x: 0, y: 3 } } }, { trajectory: { kind: 'static', at: { x: 3, y: 0 } } }],
    });
    expect(run.detections).toHaveLength(1000); // the second target, at 90°, is outside ±20°
  });

  it('the range coverage limits detections', () => {
    const run = simulateRun({ durationS: 5, pd: 1, falseAlarmRateHz: 0, maxRangeM: 4, targets: [{ trajectory: { kind: 'static', at: { x: 0, y: 5 } } }] });
    expect(run.detections).toHaveLength(0);
  });
});

describe('positioner lag and pulse phase', () => {
  it('truth follows the command late by the positioner lag', () => {
    const traj = { kind: 'circle' as const, center: { x: 0, y: 3 }, radiusM: 0.5, periodS: 10 };
    const run = simulateRun({ durationS: 5, positionerLagS: 0.4, targets: [{ trajectory: traj }] });
    const cmd = run.commanded[0].points;
    // truth at t = 2.0 s (index 20) equals the command at 1.6 s (index 16)
    expect(run.truth[20].x).toBeCloseTo(cmd[16].x, 12);
    expect(run.truth[20].y).toBeCloseTo(cmd[16].y, 12);
  });

  it('phase step gives back the radial velocity, aliased beyond ±λ·PRF/4', () => {
    // Radar facts (λ = c/f with the SI value of c; pulse-pair phase, common practice): λ(9.4 GHz) = 0.0318928 m; v = λ·Δφ/(4π·T);
    // PRF 144 Hz → unambiguous ±1.148 m/s (AMS Glossary, "maximum unambiguous velocity");
    // f_d = 2v/λ: 0.5 m/s → 31.355 Hz, i.e. Δφ = 2π·31.355/144 = 1.3681 rad per pulse.
    const lambda = 299_792_458 / 9.4e9; // c/f, c exact (SI)
    expect(lambda).toBeCloseTo(0.0318928, 7);
    const prf = 144;
    const radial = (speed: number) =>
      simulateRun({
        durationS: 3, falseAlarmRateHz: 0, pd: 1, phase: { prfHz: prf, sigmaDeg: 0 },
        antenna: { mode: 'staring', rateHz: 50 },
        targets: [{ trajectory: { kind: 'line', from: { x: 0, y: 1 }, to: { x: 0, y: 1 + speed * 10 }, speedMps: speed } }],
      }).detections.map((d) => (lambda * (d.phaseRad as number) * prf) / (4 * Math.PI));
    const slow = radial(0.5);
    expect(slow.length).toBeGreaterThan(100);
    for (const v of slow) expect(v).toBeCloseTo(0.5, 9);
    const first = simulateRun({ durationS: 1, falseAlarmRateHz: 0, pd: 1, phase: { prfHz: prf, sigmaDeg: 0 }, antenna: { mode: 'staring', rateHz: 50 }, targets: [{ trajectory: { kind: 'line', from: { x: 0, y: 1 }, to: { x: 0, y: 6 }, speedMps: 0.5 } }] }).detections[0];
    expect(first.phaseRad).toBeCloseTo(1.3681, 3);
    const vmax = (lambda * prf) / 4;
    expect(vmax).toBeCloseTo(1.148, 3);
    for (const v of radial(1.5)) expect(v).toBeCloseTo(1.5 - 2 * vmax, 9);
  });
});
