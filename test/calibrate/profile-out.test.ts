import { mkdtemp, readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { profilePath, saveTrackerProfile, tunedProfile } from '../../bridge/calibrate/profile-out.ts';
import { defaultBenchConfig } from '../../bridge/calibrate/bench-config.ts';
import { nisStats } from '../../bridge/calibrate/nis.ts';
import type { NoiseTuningResult } from '../../bridge/calibrate/noise-tuning.ts';
import { loadTrackerProfile, profileToOptions } from '../../bridge/tracking/profile.ts';
import { Tracker } from '../../bridge/tracking/tracker.ts';
import { tuneNoise } from '../../bridge/calibrate/noise-tuning.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';

const DEG = Math.PI / 180;
const result: NoiseTuningResult = {
  samples: 200, onFixedEchoes: 0, fixedEchoes: 0, sigmaRangeM: 0.045, sigmaRangeCiM: [0.04, 0.05], rangeBiasM: 0.001,
  sigmaAzimuthRad: 1.3 * DEG, sigmaAzimuthCiRad: [1.2 * DEG, 1.4 * DEG], azimuthBiasRad: 0,
  filter: { kind: 'kalman', sigmaAccel: 0.12 }, nisTuned: nisStats(new Array(100).fill(2)), nisDefault: nisStats(new Array(100).fill(1)), bracketed: true,
};
const meta = { name: 'bay3-fig8', measuredBy: 'unit test', run: 'run14.csv', dateUtc: '2026-12-02T02:00:00.000Z' };

describe('tracker profile output', () => {
  it('writes a profile the tracking module reads back, offsets negated, degrees → radians', async () => {
    const cfg = { ...defaultBenchConfig('bay 3'), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 } };
    const { profile, warnings } = tunedProfile(result, cfg, meta);
    expect(warnings).toEqual([]);
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-prof-'));
    const path = profilePath('bay3-fig8', join(dir, 'profiles'));
    await saveTrackerProfile(path, profile);
    expect(JSON.parse(await readFile(path, 'utf8')).description).toMatch(/unit test.*run14\.csv.*bay 3/);
    const opts = await loadTrackerProfile(path);
    expect(opts.measurement?.sigmaRangeM).toBe(0.045);
    expect(opts.measurement?.sigmaAzimuthRad).toBeCloseTo(1.3 * DEG, 12);
    expect(opts.measurement?.rangeOffsetM).toBe(-0.12);
    expect(opts.measurement?.azimuthOffsetRad).toBeCloseTo(-2 * DEG, 12);
    expect(opts.filter).toEqual({ kind: 'kalman', sigmaAccel: 0.12 });
  });

  it('warns about what a profile cannot hold', () => {
    const cfg = { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.1, rangeScale: 1.004, azimuthOffsetDeg: 0 } };
    const { warnings } = tunedProfile({ ...result, bracketed: false }, cfg, meta);
    expect(warnings).toHaveLength(2);
    expect(warnings[0]).toMatch(/range scale/);
  });

  it('profile names are file-name safe', () => {
    expect(profilePath('a.b_c-1', 'p')).toBe(join('p', 'a.b_c-1.json'));
    expect(() => profilePath('../etc/x')).toThrow(/profile name/);
    expect(() => profilePath('')).toThrow(/profile name/);
  });

  it('a profile tuned on one run makes the real tracker consistent on another run of the bench', () => {
    // Tune on seed 1, track seed 2 with bridge/tracking/tracker.ts and the written profile; the
    // NIS of the target's confirmed updates must sit inside its 95% bounds (Bar-Shalom 2001 §5.4).
    const bench = { ...defaultBenchConfig('bay 3'), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 }, positionerFrame: { rotationDeg: 3, translationM: { x: 0.05, y: -0.08 } } };
    const scenario = builtinScenario('offsets-check');
    const tuneRun = simulateRun({ ...scenario, seed: 1 });
    const testRun = simulateRun({ ...scenario, seed: 2 });
    for (const filter of ['kalman', 'imm'] as const) {
      const tuned = tuneNoise(tuneRun.detections, tuneRun.commanded[0].points, bench, { filter });
      const { profile } = tunedProfile(tuned, bench, meta);
      const tracker = new Tracker(profileToOptions(profile));
      const nis: number[] = [];
      let k = 0;
      const truthNear = (t: number, x: number, y: number) => {
        while (k < testRun.truth.length - 1 && testRun.truth[k + 1].timeS <= t) k++;
        const s = testRun.truth[k];
        return Math.hypot(s.x - x, s.y - y) < 0.3;
      };
      for (const d of testRun.detections) {
        for (const u of tracker.push(d).updates) if (u.status === 'confirmed' && u.nis !== undefined && truthNear(u.timeS, u.x, u.y)) nis.push(u.nis);
      }
      const s = nisStats(nis);
      expect(s.count, filter).toBeGreaterThan(60);
      expect(s.verdict, `${filter}: mean NIS ${s.mean}`).toBe('consistent');
    }
  });
});
