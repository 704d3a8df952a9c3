import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readSessionRun } from '../../bridge/calibrate/session-input.ts';
import { run as tune } from '../../bridge/cli/tune.ts';
import { Recorder } from '../../bridge/session/recorder.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';
import { loadTrackerProfile } from '../../bridge/tracking/profile.ts';
import { saveBenchConfig, defaultBenchConfig } from '../../bridge/calibrate/bench-config.ts';

/** Records a simulated run as a session, with the commanded path either as one record or as positioner samples. */
async function recordSession(dir: string, how: 'commanded' | 'positioner'): Promise<string> {
  const sim = simulateRun({ ...builtinScenario('offsets-check'), durationS: 90 });
  const rec = new Recorder({ dir, name: `bench ${how}`, source: { kind: 'simulator', name: 'test' }, startUtc: new Date('2026-12-02T01:00:00Z') });
  expect(rec.open()).toBe(true);
  const path = sim.commanded[0].points;
  if (how === 'commanded') rec.record({ kind: 'commanded', path }, 0);
  let k = 0;
  for (const d of sim.detections) {
    while (how === 'positioner' && k < path.length && path[k].timeS <= d.timeS) {
      rec.record({ kind: 'positioner', sample: { timeS: path[k].timeS, cmdX: path[k].x, cmdY: path[k].y } });
      k++;
    }
    rec.record({ kind: 'detection', detection: d });
  }
  const file = rec.status().path as string;
  await rec.close();
  return file;
}

describe('readSessionRun', () => {
  it('reads detections and the commanded-path record', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'echotrail-sess-'));
    const s = await readSessionRun(await recordSession(dir, 'commanded'));
    expect(s.pathSource).toBe('commanded');
    expect(s.detections.length).toBeGreaterThan(1000);
    expect(s.commanded!.length).toBe(901);
  });

  it("with several named positioners, takes one positioner's samples, not a path zigzagging between them", async () => {
    const dir = mkdtempSync(join(tmpdir(), 'echotrail-sess-'));
    const rec = new Recorder({ dir, name: 'two carriages', source: { kind: 'simulator', name: 'test' }, startUtc: new Date('2026-12-02T02:00:00Z') });
    expect(rec.open()).toBe(true);
    for (let i = 0; i <= 50; i++) {
      const t = i * 0.1;
      rec.record({ kind: 'positioner', sample: { timeS: t, cmdX: -1 + 0.1 * t, cmdY: 2, target: '1' } });
      rec.record({ kind: 'positioner', sample: { timeS: t, cmdX: 1 - 0.1 * t, cmdY: 3, target: '2' } });
      rec.record({ kind: 'detection', detection: { timeS: t, azimuthRad: 0.1, rangeM: 2.5, amplitude: 10 } });
    }
    const file = rec.status().path as string;
    await rec.close();
    const s = await readSessionRun(file);
    expect(s.pathSource).toBe('positioner');
    expect(s.commanded!.length).toBe(51);
    expect(s.commanded!.every((p) => p.y === 2)).toBe(true);
    expect(s.warnings).toContain(`${file} holds positioner samples of 2 positioners (1, 2); those of 1 are used`);
  });

  it('falls back to the positioner samples, and tunes from the session', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'echotrail-sess-'));
    const file = await recordSession(dir, 'positioner');
    const s = await readSessionRun(file);
    expect(s.pathSource).toBe('positioner');
    for (let i = 1; i < s.commanded!.length; i++) expect(s.commanded![i].timeS).toBeGreaterThan(s.commanded![i - 1].timeS);
    const config = join(dir, 'calibration.json');
    await saveBenchConfig(config, { ...defaultBenchConfig(), radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 }, positionerFrame: { rotationDeg: 3, translationM: { x: 0.05, y: -0.08 } } });
    expect(await tune(['--session', file, '--name', 'from-session', '--profile-dir', join(dir, 'p'), '--calibration', config])).toBe(0);
    expect((await loadTrackerProfile(join(dir, 'p', 'from-session.json'))).filter?.kind).toBe('kalman');
  });
});
