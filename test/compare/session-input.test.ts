// Comparison inputs from a recorded session, written with the project's own recorder
// (bridge/session/recorder.ts) and read back through its reader; the comparison then runs as on
// CSV input. Expected values follow from the construction of the run (bench-run.ts).
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { analyse } from '../../bridge/compare/analyse.ts';
import { readSessionInput } from '../../bridge/compare/session-input.ts';
import { sampleAt } from '../../bridge/compare/timed-path.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { startRecording } from '../../bridge/session/recorder.ts';
import type { TrackUpdate } from '../../bridge/types.ts';
import { benchRun } from './bench-run.ts';

const path = waypointsToPath([{ x: -1, y: 2, dwellS: 1 }, { x: 1, y: 2, speedMps: 0.4 }, { x: 1, y: 4, speedMps: 0.4 }]);
const run = benchRun(path, { seed: 3, lagS: 0.3 });
let dir = '';
let withCmd = '';
let positionerOnly = '';

const toUpdate = (r: TrackRow): TrackUpdate => ({
  timeS: r.timeS, id: r.id, status: r.status, x: r.x, y: r.y, vx: r.vx, vy: r.vy, speed: r.speed, headingRad: r.headingRad,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 3, misses: 0,
  measurement: r.meas ? { timeS: r.timeS, x: r.meas.x, y: r.meas.y, rxx: r.meas.sxx, rxy: r.meas.sxy, ryy: r.meas.syy } : undefined,
});

async function record(fileName: string, commandedRecord: boolean): Promise<string> {
  const rec = startRecording({ dir, fileName, name: 'compare-test', startUtc: new Date('2026-01-01T00:00:00Z') });
  if (commandedRecord) rec.record({ kind: 'commanded', path: path.points.map((p) => ({ timeS: p.timeS, x: p.x, y: p.y })) }, 0);
  const rows = [...run.rows];
  for (let t = 0; t <= path.points[path.points.length - 1].timeS + 1e-9; t += 0.1) {
    const c = sampleAt(path, t);
    rec.record({ kind: 'positioner', sample: { timeS: t, cmdX: c.x, cmdY: c.y } });
    while (rows.length && rows[0].timeS <= t) rec.record({ kind: 'track', update: toUpdate(rows.shift()!) });
  }
  for (const r of rows) rec.record({ kind: 'track', update: toUpdate(r) }); // any left by float steps
  await rec.close();
  return rec.status().path ?? join(dir, fileName);
}

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'echotrail-session-'));
  withCmd = await record('with-cmd.session.jsonl', true);
  positionerOnly = await record('pos.session.jsonl', false);
});
afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('readSessionInput', () => {
  it('takes the commanded-path record when there is one, and every track update', async () => {
    const s = await readSessionInput(withCmd);
    expect(s.pathSource).toBe('commanded');
    expect(s.paths.map((p) => p.target)).toEqual(['']);
    expect(s.paths[0].path.points).toHaveLength(path.points.length);
    expect(s.rows).toHaveLength(run.rows.length);
    expect(s.rows.filter((r) => r.meas).length).toBe(run.rows.filter((r) => r.meas).length);
  });

  it('falls back to positioner records, and both give the same lag', async () => {
    const a = await readSessionInput(withCmd);
    const b = await readSessionInput(positionerOnly);
    expect(b.pathSource).toBe('positioner');
    const la = analyse([a.paths[0].path], a.rows).lag.lagS!;
    const lb = analyse([b.paths[0].path], b.rows).lag.lagS!;
    // Within 5 ms: the two paths differ by the positioner's sampling, and the lag (found on the
    // smoothed track) is only known to a few hundredths of a second anyway (its CI).
    expect(lb).toBeCloseTo(la, 2);
    expect(la).toBeGreaterThan(0.28); // 0.3 s by construction plus the tracker's own lag
  });

  it('gives one path per target: commanded-path records by target, or positioner records by positioner', async () => {
    const rec = startRecording({ dir, fileName: 'pair.session.jsonl', name: 'pair', startUtc: new Date('2026-01-01T00:00:00Z') });
    const line = (x0: number, x1: number) => [{ timeS: 0, x: x0, y: 2 }, { timeS: 10, x: x1, y: 3 }];
    rec.record({ kind: 'commanded', target: 'A', path: line(-1, 1) }, 0);
    rec.record({ kind: 'commanded', target: 'B', path: line(1, -1) }, 0);
    rec.record({ kind: 'commanded', target: 'A', path: line(-1.5, 1.5) }, 0);
    for (let t = 0; t <= 10; t += 0.5) {
      rec.record({ kind: 'positioner', sample: { timeS: t, cmdX: -1 + 0.2 * t, cmdY: 2 + 0.1 * t, target: 'A' } });
      rec.record({ kind: 'positioner', sample: { timeS: t, cmdX: 1 - 0.2 * t, cmdY: 2 + 0.1 * t, target: 'B' } });
    }
    await rec.close();
    const file = rec.status().path ?? join(dir, 'pair.session.jsonl');
    const c = await readSessionInput(file);
    expect(c.paths.map((p) => [p.target, p.path.points[0].x])).toEqual([['A', -1.5], ['B', 1]]);
    // A later record of a target replaces its earlier one, and the warning says for which target.
    expect(c.warnings).toEqual([`session ${file} holds several commanded-path records for target A; the last one is used`]);
    const p = await readSessionInput(file, 'positioner');
    expect(p.pathSource).toBe('positioner');
    expect(p.paths.map((q) => [q.target, q.path.points[0].x, q.path.points.at(-1)!.x])).toEqual([['A', -1, 1], ['B', 1, -1]]);
  });

  it('says so when asked for a commanded-path record the session lacks', async () => {
    await expect(readSessionInput(positionerOnly, 'commanded')).rejects.toThrow(/holds no commanded-path record/);
  });
});
