// Tests bridge/cli/calibrate.ts and bridge/cli/run-command.ts.
import { mkdtemp, readFile, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { run as calibrate } from '../../bridge/cli/calibrate.ts';
import { run as simulate } from '../../bridge/cli/simulate.ts';
import { loadBenchConfig } from '../../bridge/calibrate/bench-config.ts';

describe('echotrail calibrate', () => {
  it('offsets then frame, saved into the bench config with history', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-calcli-'));
    const config = join(dir, 'calibration.json');
    expect(await simulate(['--scenario', 'tape-points', '--out', join(dir, 'tape.csv')])).toBe(0);
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflector', '0.5,1.5,A', '--reflector', '-1,3,B', '--reflector', '1.2,4.8,C', '--calibration', config, '--by', 'cli test'])).toBe(0);
    const c1 = await loadBenchConfig(config);
    expect(Math.abs(c1.radar.azimuthOffsetDeg - 2)).toBeLessThan(0.5);
    expect(c1.history[0].measuredBy).toBe('cli test');
    expect(await simulate(['--scenario', 'offsets-check', '--out', join(dir, 'd.csv'), '--commanded', join(dir, 'c.csv')])).toBe(0);
    expect(await calibrate(['frame', '--detections', join(dir, 'd.csv'), '--commanded', join(dir, 'c.csv'), '--calibration', config])).toBe(0);
    const c2 = await loadBenchConfig(config);
    expect(Math.abs(c2.positionerFrame.rotationDeg - 3)).toBeLessThan(1.5);
    expect(c2.history.map((h) => h.kind)).toEqual(['offsets', 'frame']);
  });

  it('frame from a tracks CSV: the longest track, its measurement columns', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-calcli-'));
    expect(await simulate(['--scenario', 'offsets-check', '--out', join(dir, 'd.csv'), '--commanded', join(dir, 'c.csv'), '--truth', join(dir, 't.csv'), '--range-offset', '0', '--azimuth-offset', '0'])).toBe(0);
    // A tracks file shaped like `echotrail track` output, built from the truth plus a short decoy track.
    const truth = (await readFile(join(dir, 't.csv'), 'utf8')).trim().split('\n').slice(1).map((l) => l.split(',').map(Number));
    const rows = ['time_s,track_id,x_m,y_m,meas_x_m,meas_y_m', ...truth.map(([t, , x, y]) => `${t},7,${x + 1},${y},${x},${y}`), '1,9,0,3,0,3', '2,9,0,3,0,3'];
    await writeFile(join(dir, 'tracks.csv'), rows.join('\n') + '\n');
    const config = join(dir, 'calibration.json');
    expect(await calibrate(['frame', '--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'c.csv'), '--calibration', config])).toBe(0);
    const c = await loadBenchConfig(config);
    expect(c.positionerFrame.rotationDeg).toBeCloseTo(3, 2); // truth CSV is rounded to 0.1 mm
    expect(c.positionerFrame.translationM.x).toBeCloseTo(0.05, 3);
    expect(await calibrate(['frame', '--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'c.csv'), '--track-id', '5', '--calibration', config])).toBe(1);
  });

  it('does not save a fit with a spot flagged as taped wrong, unless told to', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-calcli-'));
    const config = join(dir, 'calibration.json');
    expect(await simulate(['--scenario', 'tape-points', '--out', join(dir, 'tape.csv')])).toBe(0);
    // The three stands plus the feed cable joint (0.1, 0.6) as a fourth spot; B entered 0.2 m off
    // across the beam (true −1.0, 3.0): leave-one-out names it, and the fit it pulls is not saved.
    const spots = ['--reflector', '0.5,1.5,A', '--reflector', '-0.8,3.0,B', '--reflector', '1.2,4.8,C', '--reflector', '0.1,0.6,D'];
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), ...spots, '--calibration', config])).toBe(1);
    await expect(stat(config)).rejects.toThrow();
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), ...spots, '--calibration', config, '--save-flagged'])).toBe(0);
    expect((await loadBenchConfig(config)).history).toHaveLength(1);
    // With B where it really stands, nothing is flagged and the fit is saved.
    const right = spots.map((a) => (a === '-0.8,3.0,B' ? '-1.0,3.0,B' : a));
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), ...right, '--calibration', config])).toBe(0);
    expect((await loadBenchConfig(config)).history).toHaveLength(2);
  });

  it('a failed fit saves nothing and exits 1; bad usage exits 2', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-calcli-'));
    const config = join(dir, 'calibration.json');
    expect(await simulate(['--scenario', 'tape-points', '--out', join(dir, 'tape.csv')])).toBe(0);
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflector', '2.5,0.3', '--calibration', config])).toBe(1);
    await expect(stat(config)).rejects.toThrow();
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflector', '0.5,1.5', '--fit-scale', 'yes', '--calibration', config])).toBe(1);
    await expect(stat(config)).rejects.toThrow();
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflector', 'one,two'])).toBe(2);
    expect(await calibrate(['sideways'])).toBe(2);
    await writeFile(join(dir, 'spots.json'), JSON.stringify([{ x: 0.5, y: 1.5, label: 'A' }, { x: -1, y: 3 }, { x: 1.2, y: 4.8 }]));
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflectors', join(dir, 'spots.json'), '--dry-run'])).toBe(0);
    await writeFile(join(dir, 'bad.json'), JSON.stringify([{ x: 'near the door' }]));
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflectors', join(dir, 'bad.json'), '--dry-run'])).toBe(1);
    expect(await calibrate(['offsets', '--detections', join(dir, 'tape.csv'), '--reflector', '0.5,1.5', '--dry-run', '--calibration', config])).toBe(0);
    await expect(readFile(config, 'utf8')).rejects.toThrow();
  });
});
