// `echotrail compare` end to end on a small generated run (seeded analytic trajectory and
// stand-in tracker, test/compare/bench-run.ts): files written, figures consistent with the
// construction (lag), clear one-line failures on bad input. Exit codes per bridge/cli/main.ts.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { run } from '../../bridge/cli/compare.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { SCENARIOS } from '../../bridge/sim/scenarios.ts';
import { COMMANDED_CSV_HEADER, commandedCsvLine } from '../../bridge/sim/csv-sink.ts';
import { defaultBenchConfig } from '../../bridge/calibrate/bench-config.ts';
import { startRecording } from '../../bridge/session/recorder.ts';
import { Tracker } from '../../bridge/tracking/tracker.ts';
import { TRACKS_CSV_HEADER, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';
import { benchRun, commandedCsv, tracksCsv } from '../compare/bench-run.ts';

let dir = '';

async function capture(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const o = vi.spyOn(process.stdout, 'write').mockImplementation((s) => ((out += String(s)), true));
  const e = vi.spyOn(process.stderr, 'write').mockImplementation((s) => ((err += String(s)), true));
  try {
    return { code: await run(argv), out, err };
  } finally {
    o.mockRestore();
    e.mockRestore();
  }
}

const waypoints = {
  start_s: 0,
  waypoints: [
    { x_m: -1, y_m: 2, dwell_s: 1 }, { x_m: 1, y_m: 2, speed_mps: 0.4 }, { x_m: 1, y_m: 4, speed_mps: 0.4 },
    { x_m: -1, y_m: 4, speed_mps: 0.4, dwell_s: 1 },
  ],
};

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'echotrail-compare-'));
  const path = waypointsToPath(waypoints.waypoints.map((w) => ({ x: w.x_m, y: w.y_m, speedMps: w.speed_mps, dwellS: w.dwell_s })));
  const r = benchRun(path, { seed: 9, lagS: 0.3, pd: 0.9 });
  await writeFile(join(dir, 'tracks.csv'), tracksCsv(r.rows));
  await writeFile(join(dir, 'path.csv'), commandedCsv(path));
  await writeFile(join(dir, 'waypoints.json'), JSON.stringify(waypoints));
  await writeFile(join(dir, 'one-point.csv'), 'time_s,x_m,y_m\n0,1,2\n');
  // Two crossing targets from the project simulator, tracked by the project tracker, written by
  // the project's own CSV writers.
  const sim = simulateRun(SCENARIOS['crossing-pair']);
  const tracker = new Tracker({});
  const lines = [TRACKS_CSV_HEADER];
  for (const d of sim.detections) for (const u of tracker.push(d).updates) lines.push(trackCsvLine(u));
  for (const u of tracker.flush().updates) lines.push(trackCsvLine(u));
  await writeFile(join(dir, 'sim.tracks.csv'), lines.join('\n') + '\n');
  const cmd = [COMMANDED_CSV_HEADER];
  for (const c of sim.commanded) for (const p of c.points) cmd.push(commandedCsvLine(c.targetId, p));
  await writeFile(join(dir, 'sim.commanded.csv'), cmd.join('\n') + '\n');
  // A run on a bench whose positioner frame is turned 10° and shifted: its commanded CSV is in the
  // positioner frame, the calibration file says how to map it (format of bridge/calibrate).
  const turned = simulateRun({ ...SCENARIOS['turntable'], durationS: 30, frameRotationDeg: 10, frameTranslation: { x: 0.3, y: -0.2 } });
  const t3 = new Tracker({});
  const l3 = [TRACKS_CSV_HEADER];
  for (const d of turned.detections) for (const u of t3.push(d).updates) l3.push(trackCsvLine(u));
  for (const u of t3.flush().updates) l3.push(trackCsvLine(u));
  await writeFile(join(dir, 'turned.tracks.csv'), l3.join('\n') + '\n');
  await writeFile(join(dir, 'turned.commanded.csv'), [COMMANDED_CSV_HEADER, ...turned.commanded[0].points.map((p) => commandedCsvLine(1, p))].join('\n') + '\n');
  await writeFile(join(dir, 'calibration.json'), JSON.stringify({ ...defaultBenchConfig('test'), positionerFrame: { rotationDeg: 10, translationM: { x: 0.3, y: -0.2 } } }));
  // The same simulated run recorded as a session: positioner records and live track updates.
  const rec = startRecording({ dir, fileName: 'sim.session.jsonl', name: 'sim' });
  const tracker2 = new Tracker({});
  const pos = sim.commanded.find((c) => c.targetId === 1)!.points;
  let k = 0;
  for (const d of sim.detections) {
    while (k < pos.length && pos[k].timeS <= d.timeS) {
      rec.record({ kind: 'positioner', sample: { timeS: pos[k].timeS, cmdX: pos[k].x, cmdY: pos[k].y } });
      k++;
    }
    rec.record({ kind: 'detection', detection: d });
    for (const u of tracker2.push(d).updates) rec.record({ kind: 'track', update: u });
  }
  for (const u of tracker2.flush().updates) rec.record({ kind: 'track', update: u });
  for (; k < pos.length; k++) rec.record({ kind: 'positioner', sample: { timeS: pos[k].timeS, cmdX: pos[k].x, cmdY: pos[k].y } });
  await rec.close();
  await writeFile(join(dir, 'late.csv'), commandedCsv({ ...path, points: path.points.map((p) => ({ ...p, timeS: p.timeS + 500 })) }));
});

afterAll(async () => {
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe('echotrail compare', () => {
  it('writes summary.json, CSV series and report.html for a tracks CSV and a commanded CSV', async () => {
    const out = join(dir, 'out');
    const r = await capture(['--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'path.csv'), '--out', out]);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^lag 0\.\d{3} s \(95 % CI -?0\.\d{3}…-?0\.\d{3} s, (significant|not significant|undetermined)\) · position RMSE/);
    const summary = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8'));
    expect(summary.format).toBe('echotrail-compare-summary');
    // Lag by construction 0.3 s plus the stand-in tracker's own lag (about 0.1 s).
    expect(summary.lag.lag_s).toBeGreaterThan(0.28);
    expect(summary.lag.lag_s).toBeLessThan(0.45);
    expect(summary.smoothed_to_filtered_rmse).toBeLessThan(1);
    const errors = await readFile(join(out, 'errors.csv'), 'utf8');
    expect(errors.split('\n')[0]).toMatch(/^time_s,track_id,status,/);
    expect(errors.trim().split('\n').length).toBe(summary.tracks.followed_rows + 1);
    expect(await readFile(join(out, 'ospa-gospa.csv'), 'utf8')).toMatch(/^time_s,truths,estimates,ospa_m,gospa_m/);
    expect(await readFile(join(out, 'report.html'), 'utf8')).toMatch(/^<!doctype html>/);
    // The lag with its interval; no number with float noise (0.23720000000000008).
    expect(summary.lag.estimated_on).toBe('smoothed');
    expect(summary.lag.ci_low_s).toBeLessThanOrEqual(0.3);
    expect(summary.lag.ci_high_s).toBeGreaterThanOrEqual(0.3);
    expect(summary.lag.significant).toBe(true);
    const text = await readFile(join(out, 'summary.json'), 'utf8');
    expect(text.match(/-?\d+\.\d{7,}/g)).toBeNull();
  });

  it('a failed comparison leaves the previous report files as they were', async () => {
    const out = join(dir, 'out-keep');
    expect((await capture(['--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'path.csv'), '--out', out])).code).toBe(0);
    const before = await readFile(join(out, 'summary.json'), 'utf8');
    const r = await capture(['--tracks', join(dir, 'no-such.csv'), '--commanded', join(dir, 'path.csv'), '--out', out]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/^echotrail compare: E_\w+: /);
    expect(await readFile(join(out, 'summary.json'), 'utf8')).toBe(before);
    expect((await readdir(out)).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });

  it('runs on simulator and tracker output with two targets, comparing the one chosen by --target', async () => {
    const out = join(dir, 'out-sim');
    const r = await capture(['--tracks', join(dir, 'sim.tracks.csv'), '--commanded', join(dir, 'sim.commanded.csv'), '--target', '2', '--out', out]);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const s = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8'));
    expect(s.inputs.commanded[0]).toMatch(/target 2$/);
    expect(s.inputs.commanded).toHaveLength(2);
    // Both targets are tracked for most of the run, so OSPA/GOSPA see two truths most of the time.
    expect(s.multi_target.samples).toBeGreaterThan(100);
    expect(s.coverage.confirmed_fraction).toBeGreaterThan(0.5);
    expect(Math.abs(s.lag.lag_s)).toBeLessThan(1);
  });

  it('runs on a recorded session, taking the commanded path from its positioner records', async () => {
    const out = join(dir, 'out-session');
    const r = await capture(['--session', join(dir, 'sim.session.jsonl'), '--out', out]);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const s = JSON.parse(await readFile(join(out, 'summary.json'), 'utf8'));
    expect(s.inputs.commanded[0]).toMatch(/positioner records/);
    // Same target, same tracker settings as the CSV run of target 1: the same followed rows.
    const csv = await capture(['--tracks', join(dir, 'sim.tracks.csv'), '--commanded', join(dir, 'sim.commanded.csv'), '--target', '1', '--out', join(dir, 'out-sim1')]);
    expect(csv.code).toBe(0);
    const c = JSON.parse(await readFile(join(dir, 'out-sim1', 'summary.json'), 'utf8'));
    expect(s.tracks.followed_rows).toBe(c.tracks.followed_rows);
    expect(s.lag.lag_s).toBeCloseTo(c.lag.lag_s, 2);
  });

  it('on a session of two carriages, compares the one chosen by --target, and counts neither track as false', async () => {
    const session = join(import.meta.dirname, '..', '..', 'replays', 'bay3-crossing-carriages.session.jsonl');
    const first = await capture(['--session', session, '--out', join(dir, 'out-pair-1')]);
    expect(first.code).toBe(0);
    expect(first.err).toContain('the session commands 2 targets (1, 2): the detailed figures are for target 1 (choose another with --target)');
    const r = await capture(['--session', session, '--target', '2', '--out', join(dir, 'out-pair-2')]);
    expect(r.code).toBe(0);
    expect(r.err).toBe('');
    const s = JSON.parse(await readFile(join(dir, 'out-pair-2', 'summary.json'), 'utf8'));
    expect(s.inputs.commanded).toHaveLength(2);
    expect(s.inputs.commanded[0]).toMatch(/target 2\)$/);
    // With both carriages' paths in the set, each carriage's track has its truth: no false part.
    expect(s.multi_target.meanFalse).toBeLessThan(0.05);
    const one = JSON.parse(await readFile(join(dir, 'out-pair-1', 'summary.json'), 'utf8'));
    // Each carriage's own track is the followed one.
    expect(s.tracks.switches[0].to).not.toBe(one.tracks.switches[0].to);
    const bad = await capture(['--session', session, '--target', '3', '--out', join(dir, 'out-pair-3')]);
    expect(bad.err).toMatch(/--target 3: .* has targets 1, 2/);
  });

  it('maps a positioner-frame commanded path with the calibration file, like the explicit frame options', async () => {
    const base = ['--tracks', join(dir, 'turned.tracks.csv'), '--commanded', join(dir, 'turned.commanded.csv')];
    const rmse = async (extra: string[], name: string) => {
      const r = await capture([...base, ...extra, '--out', join(dir, name)]);
      expect(r.code, r.err).toBe(0);
      return JSON.parse(await readFile(join(dir, name, 'summary.json'), 'utf8')).whole_run.filtered.aligned.position.rmse as number;
    };
    const cal = await rmse(['--calibration', join(dir, 'calibration.json')], 'out-cal');
    const explicit = await rmse(['--frame-rotation', '10', '--frame-translation', '0.3,-0.2'], 'out-frame');
    const none = await rmse([], 'out-noframe');
    expect(cal).toBeCloseTo(explicit, 9);
    // Unmapped, the commanded circle sits ~0.4 m off the reflector's (10° about the origin and the
    // shift, worked from the transform): the error is several times the mapped one.
    expect(none).toBeGreaterThan(2.5 * cal);
    expect((await capture([...base, '--calibration', join(dir, 'calibration.json'), '--frame-rotation', '1', '--out', join(dir, 'x')])).code).toBe(1);
  });

  it('accepts waypoints instead of a commanded CSV, with the same lag', async () => {
    const a = await capture(['--tracks', join(dir, 'tracks.csv'), '--waypoints', join(dir, 'waypoints.json'), '--out', join(dir, 'out-wp')]);
    expect(a.code).toBe(0);
    const s = JSON.parse(await readFile(join(dir, 'out-wp', 'summary.json'), 'utf8'));
    const c = JSON.parse(await readFile(join(dir, 'out', 'summary.json'), 'utf8'));
    expect(s.lag.lag_s).toBeCloseTo(c.lag.lag_s, 4);
  });

  it('fails with one clear line on a one-point path and on mismatched time ranges', async () => {
    const one = await capture(['--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'one-point.csv'), '--out', join(dir, 'x')]);
    expect(one.code).toBe(1);
    expect(one.err).toMatch(/^echotrail compare: E_PATH: .*1 point\(s\)/);
    expect(one.err.trim().split('\n')).toHaveLength(1);
    const late = await capture(['--tracks', join(dir, 'tracks.csv'), '--commanded', join(dir, 'late.csv'), '--out', join(dir, 'x')]);
    expect(late.code).toBe(1);
    expect(late.err).toMatch(/E_PATH: time ranges do not match/);
  });

  it('refuses bad options and a missing input with exit code 2 or 1', async () => {
    expect((await capture(['--tracks', 'a.csv', '--commanded', 'b.csv', '--out', dir, '--cutoff', 'abc'])).code).toBe(2);
    const none = await capture(['--out', dir]);
    expect(none.code).toBe(1);
    expect(none.err).toMatch(/E_OPTION: give --tracks/);
    expect((await capture(['--commanded', 'x.csv'])).code).toBe(2); // --out is required
  });

  it('documents every option with units and defaults in --help', async () => {
    const h = await capture(['--help']);
    expect(h.code).toBe(0);
    for (const opt of ['--tracks', '--commanded', '--waypoints', '--session', '--session-path', '--out', '--follow-gate', '--max-lag', '--smoother-q', '--cutoff', '--order', '--max-range', '--max-speed']) {
      expect(h.out).toContain(opt);
    }
    expect(h.out).toMatch(/metres \(default: 1\)/);
    expect(h.out).toMatch(/m²\/s³ \(default: 0\.05\)/);
  });
});
