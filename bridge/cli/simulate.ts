/**
 * `echotrail simulate`: writes a simulated bench run as a detections CSV (the `track` input
 * format), and optionally a truth CSV (radar frame) and a commanded-path CSV (positioner frame).
 * Streams through `iterateRun`, so long runs need no memory. Files are written beside their names
 * and renamed into place at the end (atomic-file.ts): a failed run leaves earlier files as they were.
 */
import { Command, InvalidArgumentError } from 'commander';
import { numberArg as number } from './run-command.ts';
import { parseOrExit } from './parse.ts';
import { writeAtomically } from '../atomic-file.ts';
import { reportError } from './report-error.ts';
import { pathArg } from './user-dir.ts';
import { CsvSink, COMMANDED_CSV_HEADER, TRUTH_CSV_HEADER, commandedCsvLine, truthCsvLine } from '../sim/csv-sink.ts';
import { DETECTIONS_CSV_HEADER, detectionCsvLine } from '../ingest/detections-csv.ts';
import { iterateRun } from '../sim/run.ts';
import { resolveScenarioOptions, type ScenarioOptions } from '../sim/scenario.ts';
import { SCENARIOS, builtinScenario } from '../sim/scenarios.ts';
import { loadScenarioFile } from '../sim/scenario-file.ts';
import { EchotrailError } from '../errors.ts';

// Option values are checked here, while parsing, so a bad one is a usage error (exit 2) before
// anything is written; resolveScenarioOptions checks scenario files again when the run starts.
// σ = 0 is a noise-free run and a rate or lag of 0 means none, so only negatives are wrong
// (resolveScenarioOptions would otherwise clamp them to 0 without a word).
const nonNegative = (unit: string) => (v: string) => {
  const n = number(v);
  if (n < 0) throw new InvalidArgumentError(`must be ≥ 0 ${unit} (got ${v} ${unit})`);
  return n;
};
const probability = (v: string) => {
  const n = number(v);
  if (n < 0 || n > 1) throw new InvalidArgumentError(`must be between 0 and 1 (got ${v})`);
  return n;
};
const integer = (v: string) => {
  const n = number(v);
  // The generator takes a 32-bit state: a fraction would be cut off without a word (1.5 → 1), and
  // past 2⁵³ the digits typed are not the number used.
  if (!Number.isSafeInteger(n)) throw new InvalidArgumentError(`must be an integer (got ${v})`);
  return n;
};
const pair = (v: string) => {
  const parts = v.split(',').map(Number);
  if (parts.length !== 2 || parts.some((p) => !Number.isFinite(p))) throw new InvalidArgumentError('expected x,y in metres, e.g. 0.05,-0.08');
  return { x: parts[0], y: parts[1] };
};

function program(): Command {
  return new Command('echotrail simulate')
    .description('Simulate a bench run. Options given here override the scenario\'s values.')
    .option('--scenario <name|file.json>', `built-in scenario name or a scenario JSON file (built-ins: ${[...Object.keys(SCENARIOS), 'crowd'].join(', ')})`, 'rail-sweep')
    .option('--list', 'list the built-in scenarios and exit')
    .option('--print-scenario', 'print the scenario (after overrides) as JSON and exit')
    .option('--seed <n>', 'PRNG seed (integer; default: the scenario\'s, else 1)', integer)
    .option('--duration <s>', 'run length, seconds (default: the scenario\'s, else 60)', number)
    .option('--out <path>', 'detections CSV, columns time_s,azimuth_deg,range_m,amplitude; - for stdout', pathArg, '-')
    .option('--truth <path>', 'truth CSV, radar frame: time_s,target_id,x_m,y_m,vx_mps,vy_mps (default: not written)', pathArg)
    .option('--commanded <path>', 'commanded path CSV, positioner frame: time_s,target_id,x_m,y_m; a path containing {id} gives one file per target (default: not written)', pathArg)
    .option('--targets <n>', 'number of targets for the crowd scenario', number, 100)
    .option('--antenna <mode>', 'rotating or staring (default: the scenario\'s, else rotating)')
    .option('--period <s>', 'revolution period of a rotating antenna, seconds (default: the scenario\'s, else 1)', number)
    .option('--rate <hz>', 'looks per second of a staring antenna, Hz (default: the scenario\'s, else 200)', number)
    .option('--sigma-range <m>', 'range noise std, metres, ≥ 0 (default: the scenario\'s, else 0.05)', nonNegative('m'))
    .option('--sigma-azimuth <deg>', 'azimuth noise std, degrees, ≥ 0 (default: the scenario\'s, else 1.5)', nonNegative('degrees'))
    .option('--pd <p>', 'probability of detection of every target per look, 0–1 (default: the scenario\'s, else 0.95)', probability)
    .option('--false-alarm-rate <hz>', 'mean false alarms per second over the coverage, Hz, ≥ 0 (default: the scenario\'s, else 0.5)', nonNegative('Hz'))
    .option('--range-offset <m>', 'range error to simulate: measured = scale·true + offset, metres (default: the scenario\'s, else 0)', number)
    .option('--range-scale <x>', 'range scale error, unitless (default: the scenario\'s, else 1)', number)
    .option('--azimuth-offset <deg>', 'azimuth error to simulate, degrees (default: the scenario\'s, else 0)', number)
    .option('--frame-rotation <deg>', 'positioner frame rotation, counter-clockwise, degrees (default: the scenario\'s, else 0)', number)
    .option('--frame-translation <x,y>', 'positioner frame origin in the radar frame, metres (default: the scenario\'s, else 0,0)', pair)
    .option('--lag <s>', 'positioner following lag: truth = command delayed by this, seconds, ≥ 0 (default: the scenario\'s, else 0)', nonNegative('s'))
    .option('--truth-rate <hz>', 'sample rate of the truth and commanded files, Hz (default: the scenario\'s, else 10)', number)
    .exitOverride()
    .configureOutput({ writeOut: (s) => process.stdout.write(s), writeErr: (s) => process.stderr.write(s) });
}

type Opts = Record<string, unknown> & { scenario: string; out: string; targets: number };

async function scenarioFrom(opts: Opts): Promise<ScenarioOptions> {
  const base = opts.scenario.endsWith('.json') ? await loadScenarioFile(opts.scenario) : builtinScenario(opts.scenario, opts.targets);
  const s: ScenarioOptions = { ...base };
  const set = <K extends keyof ScenarioOptions>(key: K, v: unknown) => {
    if (v !== undefined) s[key] = v as ScenarioOptions[K];
  };
  set('seed', opts.seed);
  set('durationS', opts.duration);
  set('sigmaRangeM', opts.sigmaRange);
  set('sigmaAzimuthDeg', opts.sigmaAzimuth);
  set('falseAlarmRateHz', opts.falseAlarmRate);
  set('rangeOffsetM', opts.rangeOffset);
  set('rangeScale', opts.rangeScale);
  set('azimuthOffsetDeg', opts.azimuthOffset);
  set('frameRotationDeg', opts.frameRotation);
  set('frameTranslation', opts.frameTranslation);
  set('truthRateHz', opts.truthRate);
  set('positionerLagS', opts.lag);
  if (opts.pd !== undefined) s.targets = (s.targets ?? []).map((t) => ({ ...t, pd: opts.pd as number }));
  const mode = (opts.antenna as string | undefined) ?? s.antenna?.mode ?? 'rotating';
  if (mode !== 'rotating' && mode !== 'staring') throw new EchotrailError('E_OPTION', `--antenna must be rotating or staring (got '${mode}')`);
  if (mode !== s.antenna?.mode || opts.period !== undefined || opts.rate !== undefined) {
    const prev = s.antenna?.mode === mode ? s.antenna : undefined;
    s.antenna = mode === 'rotating'
      ? { ...(prev as object), mode, ...(opts.period !== undefined ? { periodS: opts.period as number } : {}) }
      : { ...(prev as object), mode, ...(opts.rate !== undefined ? { rateHz: opts.rate as number } : {}) };
  }
  return s;
}

export async function run(argv: string[]): Promise<number> {
  const cmd = program();
  const stop = parseOrExit(cmd, argv);
  if (stop !== null) return stop;
  const opts = cmd.opts() as Opts;
  if (opts.list) {
    for (const [name, s] of Object.entries(SCENARIOS)) process.stdout.write(`${name.padEnd(18)} ${s.description ?? ''}\n`);
    process.stdout.write(`${'crowd'.padEnd(18)} --targets N reflectors over 0.5–24 m with dense clutter (throughput work)\n`);
    return 0;
  }
  try {
    const scenario = await scenarioFrom(opts);
    const resolved = resolveScenarioOptions(scenario);
    if (opts.printScenario) {
      process.stdout.write(JSON.stringify({ version: 1, ...scenario }, null, 2) + '\n');
      return 0;
    }
    // One file per target when asked ({id}): readers that want one strictly time-ordered path per file.
    const cmdPath = typeof opts.commanded === 'string' ? opts.commanded : null;
    const perTarget = cmdPath?.includes('{id}') ?? false;
    const truthPath = typeof opts.truth === 'string' ? opts.truth : null;
    const cmdPaths = !cmdPath ? [] : perTarget ? resolved.targets.map((t) => cmdPath.replaceAll('{id}', String(t.id))) : [cmdPath];
    const finals = [opts.out, ...(truthPath ? [truthPath] : []), ...cmdPaths];
    const { detections, truthRows } = await writeAtomically(finals, async ([detTmp, ...rest]) => {
      const det = new CsvSink(detTmp, DETECTIONS_CSV_HEADER);
      const truth = truthPath ? new CsvSink(rest.shift()!, TRUTH_CSV_HEADER) : null;
      const commanded = cmdPath && !perTarget ? new CsvSink(rest[0], COMMANDED_CSV_HEADER) : null;
      const cmdSinks = new Map(perTarget ? resolved.targets.map((t, i) => [t.id, new CsvSink(rest[i], COMMANDED_CSV_HEADER)] as const) : []);
      for (const rec of iterateRun(resolved)) {
        if (rec.kind === 'detection') await det.push(detectionCsvLine(rec.detection));
        else if (rec.kind === 'truth') await truth?.push(truthCsvLine(rec.sample));
        else await (commanded ?? cmdSinks.get(rec.targetId))?.push(commandedCsvLine(rec.targetId, rec.point));
      }
      await Promise.all([det.close(), truth?.close(), commanded?.close(), ...[...cmdSinks.values()].map((c) => c.close())]);
      return { detections: det.lines, truthRows: truth?.lines ?? null };
    });
    process.stderr.write(`echotrail simulate: ${resolved.name}, seed ${resolved.seed}, ${resolved.durationS} s: ${detections} detections` + (truthRows !== null ? `, ${truthRows} truth rows` : '') + '\n');
    return 0;
  } catch (err) {
    return reportError('simulate', err);
  }
}
