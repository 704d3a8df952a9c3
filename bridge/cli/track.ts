/**
 * `echotrail track`: detections CSV in, tracks CSV out, no server (docs/conventions.md).
 *
 * Streams: the reader hands over detections chunk by chunk, the tracker holds only live tracks and
 * its fixed-echo map, and output lines leave in ~64 kB writes that wait for the file to drain, so
 * memory stays flat on files of millions of rows. Options given on the command line override the
 * profile, which overrides the defaults. The tracks go to a temporary file beside --out, renamed
 * over it only when the run succeeded: a failed run leaves the previous output as it was.
 */
import { createWriteStream, statSync } from 'node:fs';
import { Command, InvalidArgumentError } from 'commander';
import { numberArg as num } from './run-command.ts';
import { parseOrExit } from './parse.ts';
import { writeAtomically } from '../atomic-file.ts';
import { reportError } from './report-error.ts';
import { pathArg } from './user-dir.ts';
import { formatSkipDetails, formatSkipReport, formatWrapNote, readDetectionsCsv, type DetectionsCsvReader } from '../ingest/detections-csv.ts';
import { readDetectionsCsvInWorker } from '../ingest/detections-csv-thread.ts';
import { loadTrackerProfile } from '../tracking/profile.ts';
import { describeInference, describeNoise, Tracker, type TrackerOptionsInput } from '../tracking/tracker.ts';
import { tracksCsvSink, type RowSink } from '../tracking/tracks-csv-sink.ts';
import { TracksCsvWorkerWriter } from '../tracking/tracks-csv-thread.ts';

const DEG = Math.PI / 180;
/**
 * Input size from which `--io-threads auto` reads and writes in worker threads (about 130k rows).
 * Starting them holds the tracking up for about 0.1 s; measured on the crowded load of
 * bench/track-cli.bench.ts, threads made a 1.2 MB file 15 % slower, a 4.6 MB file 5–28 % faster
 * and a 30 MB file 30 % faster.
 */
const IO_THREADS_MIN_BYTES = 4e6;

const int = (v: string) => {
  const n = num(v);
  if (!Number.isInteger(n)) throw new InvalidArgumentError('not an integer');
  return n;
};
const mOfN = (v: string) => {
  const m = /^(\d+)\s*(?:\/|of)\s*(\d+)$/.exec(v.trim());
  if (!m) throw new InvalidArgumentError('expected M/N, e.g. 3/4');
  return { m: Number(m[1]), n: Number(m[2]) };
};
const oneOf = (...values: string[]) => (v: string) => {
  if (!values.includes(v)) throw new InvalidArgumentError(`expected one of ${values.join(', ')}`);
  return v;
};

function program(): Command {
  return new Command('echotrail track')
    .description(
      'Track a detections CSV (time_s,azimuth_deg,range_m,amplitude) into a tracks CSV: one row per confirmed-track update, in time order.\n' +
        'Antenna kind, revolution period and measurement noise are inferred from the run unless given; what was inferred is printed on stderr.',
    )
    .requiredOption('--in <file>', 'detections CSV; - for stdin', pathArg)
    .requiredOption('--out <file>', 'tracks CSV to write (replaced only when the run succeeds); - for stdout', pathArg)
    .option('--profile <file>', 'JSON tracker profile (format: bridge/tracking/profile.ts); command-line options override it', pathArg)
    .option('--antenna <kind>', 'auto, rotating or staring (default: auto: from azimuth wrap-around)', oneOf('auto', 'rotating', 'staring'))
    .option('--interval <s>', 'revolution period (rotating) or per-target update interval (staring), s (default: inferred)', num)
    .option('--sigma-range <m>', 'range noise σ, m (default: 0.05, or estimated from stationary reflectors)', num)
    .option('--sigma-azimuth <deg>', 'azimuth noise σ, degrees (default: 1.5, or estimated from stationary reflectors)', num)
    .option('--no-estimate-noise', 'do not estimate the noise from the run; use the σ values (or their defaults)')
    .option('--conversion <kind>', 'polar→Cartesian conversion: unbiased (Mo et al. 1998) or linearised (default: unbiased)', oneOf('unbiased', 'linearised'))
    .option('--range-offset <m>', 'added to every range, m (default: 0)', num)
    .option('--azimuth-offset <deg>', 'added to every azimuth, degrees (default: 0)', num)
    .option('--filter <kind>', 'imm (CV at two noise levels), kalman (CV) or alpha-beta (default: imm)', oneOf('imm', 'kalman', 'alpha-beta'))
    .option('--process-noise <model>', 'dwna or cwna process noise for kalman/imm (default: dwna)', oneOf('dwna', 'cwna'))
    .option('--sigma-accel <mps2>', 'acceleration noise σ of the kalman filter and of the α-β tracking index, m/s² (default: 0.3)', num)
    .option('--imm-low <mps2>', 'IMM quiet-model acceleration σ, m/s² (default: 0.05)', num)
    .option('--imm-high <mps2>', 'IMM manoeuvre-model acceleration σ, m/s² (default: 1.0)', num)
    .option('--alpha <a>', 'fixed α for alpha-beta, 0–1 (default: from Kalata\'s tracking index)', num)
    .option('--beta <b>', 'fixed β for alpha-beta (default: from Kalata\'s tracking index)', num)
    .option('--gate-probability <p>', 'χ² gate probability P_G, 0–1 (default: 0.99)', num)
    .option('--confirm <M/N>', 'M-of-N confirmation: M hits within N scans (default: 3/4)', mOfN)
    .option('--max-speed <mps>', 'fastest expected target, m/s: no track takes a detection farther from its last hit than this speed covers, plus noise (default: 1.5)', num)
    .option('--max-misses <n>', 'consecutive missed scans before a confirmed track is deleted (default: 3)', int)
    .option('--min-coast <s>', 'never delete for misses before this much coasting, s (default: 1)', num)
    .option('--max-sigma <m>', 'delete a track whose position σ exceeds this plus twice the measurement σ there, m (default: 1.5)', num)
    .option('--no-fixed-echoes', 'do not learn fixed echoes (stationary reflectors then stay as tracks, see --stationary)')
    .option('--fixed-after <s>', 'a reflector seen in most scans this long becomes a fixed echo, s (default: max(10 s, 8 scans))', num)
    .option('--move-threshold <m>', 'displacement that makes a track a moving target, m (default: 0.15)', num)
    .option('--fixed-forget <s>', 'forget a fixed echo not seen this long, s (default: 60)', num)
    .option('--stationary', 'also write confirmed tracks that never moved (default: only moving or recently moving targets)')
    .option('--batch <s>', 'assignment batch window, s (default: half the revolution period or update interval)', num)
    .option('--per-detection', 'rotating antenna: assign each detection as the beam passes its gate, as the live view does, instead of per half revolution (slower; same tracks within noise)')
    .option('--max-range <m>', 'input rows with a larger range are skipped as absurd, m (default: 1000)', num)
    .option('--io-threads <when>', `read the input and write the output in worker threads, beside the tracking: auto (when the input is a file of ${IO_THREADS_MIN_BYTES / 1e6} MB or more), always or never (default: auto)`, oneOf('auto', 'always', 'never'))
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s), writeOut: (s) => process.stdout.write(s) });
}

type Opts = Record<string, unknown>;

/** Command-line options → tracker options; only what was given, so profile values survive. */
export function optionsFromCli(o: Opts, given: (k: string) => boolean): TrackerOptionsInput {
  const g = (k: string) => (given(k) ? o[k] : undefined);
  const pick = <T extends object>(v: T): T | undefined => {
    const e = Object.entries(v).filter(([, x]) => x !== undefined);
    return e.length ? (Object.fromEntries(e) as T) : undefined;
  };
  const deg = (k: string) => (g(k) === undefined ? undefined : (g(k) as number) * DEG);
  const confirm = g('confirm') as { m: number; n: number } | undefined;
  const res: TrackerOptionsInput = {
    antenna: g('antenna') as TrackerOptionsInput['antenna'],
    intervalS: g('interval') as number | undefined,
    estimateNoise: given('estimateNoise') ? (o.estimateNoise as boolean) : undefined,
    batchS: g('batch') as number | undefined,
    // A file has no one waiting for the next update: batch half revolutions unless told otherwise.
    revolutionBatches: given('perDetection') ? !(o.perDetection as boolean) : true,
    reportStationary: g('stationary') as boolean | undefined,
    measurement: pick({
      conversion: g('conversion') as 'unbiased' | 'linearised' | undefined,
      sigmaRangeM: g('sigmaRange') as number | undefined,
      sigmaAzimuthRad: deg('sigmaAzimuth'),
      rangeOffsetM: g('rangeOffset') as number | undefined,
      azimuthOffsetRad: deg('azimuthOffset'),
    }),
    filter: pick({
      kind: g('filter') as 'imm' | 'kalman' | 'alpha-beta' | undefined,
      processNoise: g('processNoise') as 'dwna' | 'cwna' | undefined,
      sigmaAccel: g('sigmaAccel') as number | undefined,
      sigmaLow: g('immLow') as number | undefined,
      sigmaHigh: g('immHigh') as number | undefined,
      alpha: g('alpha') as number | undefined,
      beta: g('beta') as number | undefined,
    }),
    gate: pick({ probability: g('gateProbability') as number | undefined }),
    initiation: pick({ m: confirm?.m, n: confirm?.n, maxSpeedMps: g('maxSpeed') as number | undefined }),
    deletion: pick({ maxMisses: g('maxMisses') as number | undefined, minCoastS: g('minCoast') as number | undefined, maxPositionSigmaM: g('maxSigma') as number | undefined }),
    fixedEchoes: pick({
      enabled: given('fixedEchoes') ? (o.fixedEchoes as boolean) : undefined,
      afterS: g('fixedAfter') as number | undefined,
      moveThresholdM: g('moveThreshold') as number | undefined,
      forgetS: g('fixedForget') as number | undefined,
    }),
  };
  return Object.fromEntries(Object.entries(res).filter(([, v]) => v !== undefined)) as TrackerOptionsInput;
}

/** Profile, then command line, group by group. */
function merge(a: TrackerOptionsInput, b: TrackerOptionsInput): TrackerOptionsInput {
  const out: Record<string, unknown> = { ...a };
  for (const [k, v] of Object.entries(b)) {
    const prev = out[k];
    out[k] = v && typeof v === 'object' && prev && typeof prev === 'object' ? { ...prev, ...v } : v;
  }
  return out as TrackerOptionsInput;
}

export async function run(argv: string[]): Promise<number> {
  const cmd = program();
  const stop = parseOrExit(cmd, argv);
  if (stop !== null) return stop;
  const o = cmd.opts();
  try {
    const given = (k: string) => cmd.getOptionValueSource(k) === 'cli';
    const fromProfile = o.profile ? await loadTrackerProfile(o.profile as string) : {};
    const tracker = new Tracker(merge(fromProfile, optionsFromCli(o, given)));
    const threads = ioThreads((o.ioThreads as IoThreads | undefined) ?? 'auto', o.in as string);
    await writeAtomically([o.out as string], ([out]) => trackFile(tracker, o.in as string, out, o.out as string, o.maxRange as number | undefined, threads));
    return 0;
  } catch (err) {
    if (process.stderr.isTTY === true) process.stderr.write('\r\x1b[K');
    return reportError('track', err, 2);
  }
}

type IoThreads = 'auto' | 'always' | 'never';

/** Whether the file stages run in worker threads (never for stdin or stdout, see trackFile). */
function ioThreads(when: IoThreads, input: string): boolean {
  if (when !== 'auto') return when === 'always';
  return input !== '-' && (statSync(input, { throwIfNoEntry: false })?.size ?? 0) >= IO_THREADS_MIN_BYTES;
}

/**
 * The streaming loop: reader → tracker → CSV, with the stderr reports. With `threads`, the
 * reading and the writing run in worker threads, so the tracking has this thread to itself
 * (stdin and stdout stay here: a worker would only relay them).
 */
async function trackFile(tracker: Tracker, input: string, output: string, shownOutput: string, maxRangeM: number | undefined, threads: boolean): Promise<void> {
  const readOptions = maxRangeM !== undefined ? { maxRangeM } : {};
  const reader = threads && input !== '-' ? readDetectionsCsvInWorker(input, readOptions) : readDetectionsCsv(input, readOptions);
  const sink: RowSink = threads && output !== '-' ? await TracksCsvWorkerWriter.open(output, shownOutput) : tracksCsvSink(output === '-' ? process.stdout : createWriteStream(output), output !== '-', shownOutput);
  try {
    await trackLoop(tracker, reader, sink);
  } catch (err) {
    // Release the half-written temporary file; the caller removes it.
    sink.abandon();
    throw err;
  }
  if (process.stderr.isTTY === true) process.stderr.write('\r\x1b[K');
  const skipped = formatSkipReport(reader.report);
  if (skipped) process.stderr.write(`echotrail track: ${skipped}\n`);
  for (const l of formatSkipDetails(reader.report)) process.stderr.write(`echotrail track:   ${l}\n`);
  const wrapped = formatWrapNote(reader.report);
  if (wrapped) process.stderr.write(`echotrail track: ${wrapped}\n`);
  const inf = tracker.inferred();
  if (inf?.outOfOrder) process.stderr.write(`echotrail track: ${inf.outOfOrder} detection(s) ignored: time went backwards\n`);
}

/** Reader → tracker → sink, waiting for the sink to have room. */
async function trackLoop(tracker: Tracker, reader: DetectionsCsvReader, sink: RowSink): Promise<void> {
  const tty = process.stderr.isTTY === true;
  let told = false;
  let lastProgress = 0;
  let rows = 0;
  let noiseTold = false;
  const tell = () => {
    const inf = tracker.inferred();
    if (!inf || (told && (noiseTold || inf.noisePending))) return;
    if (tty) process.stderr.write('\r\x1b[K');
    // Tracking starts once the antenna is known; a noise estimate still running is reported
    // again when it is done.
    if (!told) for (const l of describeInference(inf)) process.stderr.write(`echotrail track: ${l}\n`);
    else process.stderr.write(`echotrail track: ${describeNoise(inf)}\n`);
    told = true;
    noiseTold = !inf.noisePending;
  };
  for await (const batch of reader.batches()) {
    for (const d of batch) {
      const r = tracker.push(d);
      for (const u of r.updates) sink.add(u);
    }
    rows += batch.length;
    tell();
    await sink.room();
    if (tty && performance.now() - lastProgress > 500) {
      lastProgress = performance.now();
      const t = batch.length ? batch[batch.length - 1].timeS : 0;
      process.stderr.write(`\r\x1b[K${rows} rows, ${t.toFixed(1)} s of run, ${tracker.tracks().length} live tracks`);
    }
  }
  for (const u of tracker.flush().updates) sink.add(u);
  tell();
  await sink.end();
}
