// Tests bridge/cli/tune.ts.
import { mkdtemp } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { run as tune } from '../../bridge/cli/tune.ts';
import { run as simulate } from '../../bridge/cli/simulate.ts';
import { loadTrackerProfile } from '../../bridge/tracking/profile.ts';
import { loadBenchConfig, saveBenchConfig, defaultBenchConfig } from '../../bridge/calibrate/bench-config.ts';

describe('echotrail tune', () => {
  it('writes a named profile the tracker can load', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-tunecli-'));
    const config = join(dir, 'calibration.json');
    await saveBenchConfig(config, { ...defaultBenchConfig('bay 3'), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 }, positionerFrame: { rotationDeg: 3, translationM: { x: 0.05, y: -0.08 } } });
    expect(await simulate(['--scenario', 'offsets-check', '--out', join(dir, 'd.csv'), '--commanded', join(dir, 'c.csv')])).toBe(0);
    const code = await tune(['--detections', join(dir, 'd.csv'), '--commanded', join(dir, 'c.csv'), '--name', 'bay3-eight', '--profile-dir', join(dir, 'profiles'), '--calibration', config, '--by', 'cli test']);
    expect(code).toBe(0);
    const opts = await loadTrackerProfile(join(dir, 'profiles', 'bay3-eight.json'));
    expect(opts.measurement?.rangeOffsetM).toBe(-0.12);
    expect(opts.filter?.kind).toBe('kalman');
    expect((await loadBenchConfig(config)).history.at(-1)?.kind).toBe('noise');
  });

  it('refuses a bad name or filter before reading anything', async () => {
    expect(await tune(['--detections', 'x.csv', '--commanded', 'y.csv', '--name', '../x'])).toBe(1);
    expect(await tune(['--detections', 'x.csv', '--commanded', 'y.csv', '--name', 'ok', '--filter', 'magic'])).toBe(1);
    expect(await tune(['--detections', 'x.csv'])).toBe(2); // --name is required
    expect(await tune(['--name', 'ok'])).toBe(1); // no input named
  });
});
