/**
 * `echotrail demo`: (re)builds the demo sessions in replays/ that `npm start` plays.
 *
 * Each demo is a simulated run of the invented "bay 3" bench (bridge/sim/scenarios.ts) passed
 * through the real tracker and written by the real recorder, exactly as a live serial run would
 * be: detections, antenna pointing, positioner samples, the tracker's output and fixed-echo map
 * snapshots, plus the commanded path. Seeds are fixed, so rebuilding gives the same files.
 */
import { Command } from 'commander';
import { parseOrExit } from './parse.ts';
import { pathArg } from './user-dir.ts';
import { REPO_ROOT } from '../server/web-build.ts';
import { rmSync, readdirSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { iterateRun } from '../sim/run.ts';
import { wireRecords, wireTime } from '../sim/wire-records.ts';
import { resolveScenarioOptions, type ScenarioOptions } from '../sim/scenario.ts';
import { builtinScenario } from '../sim/scenarios.ts';
import { Tracker } from '../tracking/tracker.ts';
import { Recorder } from '../session/recorder.ts';
import { SESSION_SUFFIX } from '../session/format.ts';
import type { TrackerOutput } from '../types.ts';

/** One demo run: the built-in scenario it comes from, its seed and the name it is recorded under. */
export interface DemoRun {
  /** Session name (header and file name). */
  name: string;
  /** Built-in scenario of bridge/sim/scenarios.ts. */
  scenario: string;
  seed: number;
  /** Wall-clock start written in the header (fixed, so the files are reproducible). */
  startUtc: string;
}

export const DEMO_RUNS: DemoRun[] = [
  { name: 'bay3-turntable-loop', scenario: 'turntable', seed: 11, startUtc: '2026-11-23T09:14:00Z' },
  { name: 'bay3-rail-stops', scenario: 'rail-sweep', seed: 12, startUtc: '2026-11-23T09:41:30Z' },
  { name: 'bay3-crossing-carriages', scenario: 'crossing-pair', seed: 13, startUtc: '2026-11-23T10:05:10Z' },
  { name: 'bay3-stage-figure-eight', scenario: 'xy-eight', seed: 14, startUtc: '2026-11-23T10:32:45Z' },
];

/** Rates of the records the acquisition hardware would interleave with detections. */
const ANTENNA_RATE_HZ = 10;
const FIXED_ECHO_EVERY_S = 5;

/** Records one demo run into `dir`; returns the file path. */
export function recordDemoRun(run: DemoRun, dir: string): string {
  const scenario: ScenarioOptions = { ...builtinScenario(run.scenario), seed: run.seed };
  const sc = resolveScenarioOptions(scenario);
  const tracker = new Tracker({});
  const rec = new Recorder({
    dir,
    name: run.name,
    fileName: `${run.name}${SESSION_SUFFIX}`,
    source: { kind: 'simulator', name: `scenario ${run.scenario}, seed ${run.seed}` },
    config: { scenario: sc.description, tracker: 'defaults (auto)' },
    startUtc: new Date(run.startUtc),
    writer: 'echotrail demo',
  });
  if (!rec.open()) throw new Error(rec.status().error ?? 'cannot record');
  rec.note(`demo run: ${sc.description}`, 0);

  // One commanded path per target; with several, each is named by its target id.
  const commanded = new Map<number, { timeS: number; x: number; y: number }[]>(sc.targets.map((t) => [t.id, []]));
  for (const r of iterateRun(sc)) if (r.kind === 'commanded') commanded.get(r.targetId)?.push(r.point);
  for (const [id, path] of commanded) rec.record(sc.targets.length > 1 ? { kind: 'commanded', path, target: String(id) } : { kind: 'commanded', path }, 0);

  const emit = (out: TrackerOutput) => {
    for (const update of out.updates) rec.record({ kind: 'track', update });
    for (const deletion of out.deletions) rec.record({ kind: 'deletion', deletion });
  };
  let nextEchoes = FIXED_ECHO_EVERY_S;
  for (const r of wireRecords(sc, 0, ANTENNA_RATE_HZ)) {
    const t = wireTime(r);
    if (t >= nextEchoes) {
      rec.record({ kind: 'fixed-echoes', echoes: tracker.fixedEchoes() }, t);
      nextEchoes += FIXED_ECHO_EVERY_S;
    }
    rec.record(r);
    if (r.kind === 'detection') emit(tracker.push(r.detection));
  }
  emit(tracker.flush());
  rec.record({ kind: 'fixed-echoes', echoes: tracker.fixedEchoes() }, sc.durationS);
  rec.closeSync();
  return rec.status().path ?? join(dir, `${run.name}${SESSION_SUFFIX}`);
}

export async function run(argv: string[]): Promise<number> {
  const cmd = new Command('echotrail demo')
    .description('Rebuild the demo sessions (simulated runs of the invented bay 3 bench) that npm start replays.')
    .option('--out <dir>', 'folder to write the session files into (default: the repository\'s replays/, where npm start finds them)', pathArg)
    .option('--only <name>', 'rebuild one run only (' + DEMO_RUNS.map((r) => r.name).join(', ') + ')');
  const stop = parseOrExit(cmd, argv);
  if (stop !== null) return stop;
  const opts = cmd.opts<{ out?: string; only?: string }>();
  const runs = DEMO_RUNS.filter((r) => !opts.only || r.name === opts.only);
  if (runs.length === 0) {
    process.stderr.write(`echotrail demo: no demo run named '${opts.only}'\n`);
    return 2;
  }
  // The repository's folder by default, wherever the command was run from (main.ts moves to the user's directory).
  opts.out ??= join(REPO_ROOT, 'replays');
  mkdirSync(opts.out, { recursive: true });
  if (!opts.only) {
    for (const f of readdirSync(opts.out)) if (f.endsWith(SESSION_SUFFIX)) rmSync(join(opts.out, f));
  }
  for (const r of runs) process.stdout.write(`${recordDemoRun(r, opts.out)}\n`);
  return 0;
}
