/**
 * `echotrail compare`: how well did the radar follow what the positioner was told to do?
 * Reads a tracks CSV (or a recorded session) and the commanded path, writes summary.json, CSV
 * series and a self-contained report.html into --out. Exit 0 on success, 1 on unusable input
 * (one line on stderr with the error code), 2 on a usage error.
 */
import { basename } from 'node:path';
import { Command, CommanderError, Option } from 'commander';
import { loadBenchConfig } from '../calibrate/bench-config.ts';
import { EchotrailError } from '../errors.ts';
import { analyse } from '../compare/analyse.ts';
import { readCommandedCsv } from '../compare/commanded-csv.ts';
import { pathToRadarFrame, type FrameTransform } from '../compare/frame.ts';
import { readSessionInput, type SessionPathSource } from '../compare/session-input.ts';
import type { TimedPath } from '../compare/timed-path.ts';
import { readTracksCsv, type TrackRow } from '../compare/track-rows.ts';
import { readWaypoints } from '../compare/waypoints.ts';
import { writeOutputs } from '../compare/write-outputs.ts';
import { reportError } from './report-error.ts';
import { pathArg } from './user-dir.ts';
import type { LagInterval } from '../compare/lag-interval.ts';

function num(name: string, { min = -Infinity, positive = false } = {}) {
  return (v: string): number => {
    const n = Number(v);
    if (v.trim() === '' || !Number.isFinite(n) || n < min || (positive && n <= 0)) {
      throw new EchotrailError('E_OPTION', `--${name} '${v}' is not ${positive ? 'a positive' : 'a'} number${min > -Infinity ? ` ≥ ${min}` : ''}`);
    }
    return n;
  };
}

function program(): Command {
  return new Command('echotrail compare')
    .description('Compare the tracked path with the commanded path: lag, along/cross-track errors, RMSE/mean/max/p95 per leg and whole run, filtered and RTS-smoothed, OSPA/GOSPA. Writes summary.json, errors.csv, ospa-gospa.csv, lag-search.csv and report.html into --out.')
    .option('--tracks <file>', 'tracks CSV as written by `echotrail track`', pathArg)
    .option('--commanded <files...>', 'commanded path CSV(s): time_s,x_m,y_m or time_s,azimuth_deg,range_m (optional segment column); the first is compared with the followed track, all enter OSPA/GOSPA', (v: string, prev: string[] | undefined) => [...(prev ?? []), pathArg(v)])
    .option('--waypoints <file>', 'waypoints with speeds instead of --commanded: JSON {"start_s", "waypoints": [{x_m, y_m, speed_mps, dwell_s}]} or CSV x_m,y_m,speed_mps,dwell_s', pathArg)
    .option('--target <id>', 'with a target_id column in --commanded, or a session commanding several targets: the target compared with the followed track (default: the first)')
    .option('--calibration <file>', 'bench calibration file (calibration.json, written by `echotrail calibrate`): its positioner frame maps the commanded path into the radar frame', pathArg)
    .option('--frame-rotation <deg>', 'instead of --calibration: the positioner frame is turned this much counter-clockwise from the radar frame, degrees (default: 0)', num('frame-rotation'))
    .option('--frame-translation <x,y>', 'instead of --calibration: positioner frame origin in the radar frame, metres (default: 0,0)', pair)
    .option('--session <file>', 'recorded session (.session.jsonl): its track updates, and its commanded path unless --commanded/--waypoints is given', pathArg)
    .addOption(new Option('--session-path <source>', 'which session records give the commanded path').choices(['auto', 'commanded', 'positioner']).default('auto'))
    .requiredOption('--out <dir>', 'output folder (created if missing); its files are replaced only when the comparison succeeds', pathArg)
    .option('--title <text>', 'report title (default: the tracks or session file name)')
    .option('--follow-gate <m>', 'a track further than this from the command cannot become the followed one, metres', num('follow-gate', { positive: true }), 1.0)
    .option('--follow-stale <s>', 'the followed track is lost after this long without an update, seconds', num('follow-stale', { positive: true }), 2.0)
    .option('--release <m>', 'the followed track stops counting when it strays further than this, metres (default: twice --follow-gate)', num('release', { positive: true }))
    .option('--follow-memory <s>', 'time constant of the running distance by which tracks compete for the role, seconds (0: latest update only)', num('follow-memory', { min: 0 }), 2)
    .option('--switch-margin <m>', 'another track must be this much closer to take over, metres', num('switch-margin', { min: 0 }), 0.2)
    .option('--max-lag <s>', 'largest lag searched either way, seconds', num('max-lag', { positive: true }), 2.0)
    .option('--lag-step <s>', 'grid step of the coarse lag search before refinement, seconds', num('lag-step', { positive: true }), 0.05)
    .option('--smoother-q <m2s3>', 'white-noise acceleration spectral density of the smoother, m²/s³', num('smoother-q', { positive: true }), 0.05)
    .option('--corner <deg>', 'a turn sharper than this starts a new leg, degrees', num('corner', { positive: true }), 20)
    .option('--cutoff <m>', 'OSPA/GOSPA cut-off c, metres', num('cutoff', { positive: true }), 1.0)
    .option('--order <p>', 'OSPA/GOSPA order p (≥ 1)', num('order', { min: 1 }), 2)
    .option('--set-step <s>', 'time step of the OSPA/GOSPA series, seconds', num('set-step', { positive: true }), 0.1)
    .option('--max-age <s>', 'a track not updated for this long leaves the OSPA/GOSPA estimate set, seconds', num('max-age', { positive: true }), 1.5)
    .option('--min-overlap <fraction>', 'least overlap of the track and commanded time spans, as a fraction of the shorter', num('min-overlap', { min: 0 }), 0.5)
    .option('--max-range <m>', 'positions further from the radar are refused as wrong units, metres', num('max-range', { positive: true }), 50)
    .option('--max-speed <mps>', 'commanded speeds above this are refused as wrong units, m/s', num('max-speed', { positive: true }), 5)
    .addHelpText('after', '\nExample:\n  echotrail compare --tracks run7.tracks.csv --commanded run7.path.csv \\\n      --out reports/run7\n  echotrail compare --session sessions/run7.session.jsonl --out reports/run7');
}

function pair(v: string): [number, number] {
  const parts = v.split(',').map((p) => Number(p.trim()));
  if (parts.length !== 2 || !parts.every(Number.isFinite)) throw new EchotrailError('E_OPTION', `--frame-translation '${v}' is not two numbers x,y in metres`);
  return [parts[0], parts[1]];
}

interface Parsed {
  tracks?: string; commanded?: string[]; waypoints?: string; target?: string; calibration?: string; frameRotation?: number; frameTranslation?: [number, number]; session?: string; sessionPath: SessionPathSource; out: string; title?: string;
  followGate: number; release?: number; followStale: number; followMemory: number; switchMargin: number; maxLag: number; lagStep: number; smootherQ: number; corner: number;
  cutoff: number; order: number; setStep: number; maxAge: number; minOverlap: number; maxRange: number; maxSpeed: number;
}

/** The lag's confidence interval for the summary line: ` (95 % CI −0.023…0.038 s, not significant)`. */
function lagNote(ci: LagInterval | null): string {
  if (!ci) return ' (too few samples for an interval)';
  const verdict = ci.undetermined ? 'undetermined' : ci.significant ? 'significant' : 'not significant';
  return ` (${Math.round(ci.level * 100)} % CI ${ci.lowS.toFixed(3)}…${ci.highS.toFixed(3)} s, ${verdict})`;
}

/** Run the subcommand; returns the exit code. */
export async function run(argv: string[]): Promise<number> {
  const cmd = program().exitOverride().configureOutput({ writeErr: (s) => process.stderr.write(s) });
  let o: Parsed;
  try {
    o = cmd.parse(argv, { from: 'user' }).opts<Parsed>();
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode === 0 ? 0 : 2;
    return reportError('compare', err, 2);
  }
  try {
    return await compare(o);
  } catch (err) {
    return reportError('compare', err);
  }
}

/** The positioner → radar transform: from the calibration file, or the explicit options, or none. */
async function frameOf(o: Parsed): Promise<FrameTransform> {
  if (o.calibration) {
    if (o.frameRotation !== undefined || o.frameTranslation) throw new EchotrailError('E_OPTION', 'give either --calibration or --frame-rotation/--frame-translation, not both');
    const f = (await loadBenchConfig(o.calibration)).positionerFrame;
    return { rotationRad: (f.rotationDeg * Math.PI) / 180, tx: f.translationM.x, ty: f.translationM.y };
  }
  const [tx, ty] = o.frameTranslation ?? [0, 0];
  return { rotationRad: ((o.frameRotation ?? 0) * Math.PI) / 180, tx, ty };
}

async function compare(o: Parsed): Promise<number> {
  const units = { maxRangeM: o.maxRange, maxSpeedMps: o.maxSpeed };
  if (!o.tracks && !o.session) throw new EchotrailError('E_OPTION', 'give --tracks TRACKS.csv or --session FILE');
  if (o.tracks && o.session) throw new EchotrailError('E_OPTION', 'give either --tracks or --session, not both');
  if (o.commanded && o.waypoints) throw new EchotrailError('E_OPTION', 'give either --commanded or --waypoints, not both');
  let paths: TimedPath[] = [];
  const names: string[] = [];
  for (const f of o.commanded ?? []) {
    const targets = await readCommandedCsv(f, units);
    // The chosen target first: it is the one the single-target figures use.
    if (o.target !== undefined && paths.length === 0) {
      const i = targets.findIndex((t) => t.target === o.target);
      if (i < 0) throw new EchotrailError('E_OPTION', `--target ${o.target}: ${f} has targets ${targets.map((t) => t.target || '(none)').join(', ')}`);
      targets.unshift(...targets.splice(i, 1));
    }
    for (const t of targets) {
      paths.push(t.path);
      names.push(t.target ? `${f} target ${t.target}` : f);
    }
  }
  if (o.waypoints) {
    paths.push(await readWaypoints(o.waypoints, units));
    names.push(o.waypoints);
  }
  let rows: TrackRow[];
  const warnings: string[] = [];
  if (o.session) {
    const s = await readSessionInput(o.session, o.sessionPath, units);
    rows = s.rows;
    warnings.push(...s.warnings);
    if (paths.length === 0) {
      const from = s.pathSource === 'commanded' ? 'commanded-path record' : 'positioner records';
      const targets = [...s.paths];
      // The chosen target first: it is the one the single-target figures use; the set figures
      // (OSPA/GOSPA) use every target, so no carriage's track counts as a false one.
      if (o.target !== undefined) {
        const i = targets.findIndex((t) => t.target === o.target);
        if (i < 0) throw new EchotrailError('E_OPTION', `--target ${o.target}: ${o.session} has targets ${targets.map((t) => t.target || '(none)').join(', ')}`);
        targets.unshift(...targets.splice(i, 1));
      } else if (targets.length > 1) {
        warnings.push(`the session commands ${targets.length} targets (${targets.map((t) => t.target || '(unnamed)').join(', ')}): the detailed figures are for target ${targets[0].target} (choose another with --target); OSPA/GOSPA cover them all`);
      }
      for (const t of targets) {
        paths.push(t.path);
        names.push(`${o.session} (${from}${t.target ? `, target ${t.target}` : ''})`);
      }
    }
  } else {
    if (paths.length === 0) throw new EchotrailError('E_OPTION', 'give the commanded path: --commanded PATH.csv or --waypoints FILE');
    rows = await readTracksCsv(o.tracks!, units);
  }
  const frame = await frameOf(o);
  paths = paths.map((p) => pathToRadarFrame(p, frame));
  const analysis = analyse(paths, rows, {
    follow: { gateM: o.followGate, staleS: o.followStale, switchMarginM: o.switchMargin, releaseM: o.release, memoryS: o.followMemory },
    lag: { maxLagS: o.maxLag, stepS: o.lagStep },
    legs: { cornerDeg: o.corner },
    smoother: { accelPsd: o.smootherQ },
    multi: { cutoffM: o.cutoff, order: o.order, stepS: o.setStep, maxAgeS: o.maxAge },
    minOverlap: o.minOverlap,
  });
  const source = (o.tracks ?? o.session)!;
  const written = await writeOutputs(o.out, analysis, { tracks: source, commanded: names, warnings }, {
    title: o.title ?? `Commanded vs tracked — ${basename(source)}`,
    generatedUtc: new Date().toISOString(),
  });
  const f = analysis.whole.filtered;
  const s = analysis.whole.smoothed;
  const fix = (v: number | null | undefined, d = 3) => (v === null || v === undefined ? '–' : v.toFixed(d));
  process.stdout.write(
    `lag ${fix(analysis.lag.lagS)} s${lagNote(analysis.lagInterval)} · position RMSE ${fix(f.noLag.position.rmse)} m raw, ${fix(f.aligned.position.rmse)} m lag removed, ${s ? `${fix(s.aligned.position.rmse)} m smoothed` : 'no smoothing (no measurement columns)'} · ` +
      `confirmed ${fix(analysis.coverage.confirmedFraction * 100, 1)} % · mean GOSPA ${fix(analysis.setSummary.meanGospaM)} m\n`,
  );
  for (const w of warnings) process.stderr.write(`echotrail compare: warning: ${w}\n`);
  process.stdout.write(`wrote ${written.join(', ')}\n`);
  return 0;
}
