/**
 * `echotrail calibrate offsets|frame`: fits the radar's range/azimuth offsets from a reflector at
 * tape-measured positions, or the positioner frame from a run and its commanded path, and saves
 * the result into the bench config (bridge/calibrate/bench-config.ts) unless --dry-run.
 * A failed fit saves nothing.
 */
import { Command, InvalidArgumentError } from 'commander';
import { loadBenchConfig, saveBenchConfig, withCalibration, correctDetection } from '../calibrate/bench-config.ts';
import { alignFrame, frameWarnings } from '../calibrate/frame-align.ts';
import { fitRadarOffsets, fixedWithMinus, spotFlags, type ReflectorPosition, type ReflectorResidual } from '../calibrate/offsets.ts';
import { MIN_REVOLUTIONS_PER_SPOT, MIN_STARING_S_PER_SPOT } from '../calibrate/guide.ts';
import { parseTracksById, readPathCsv, type TimedPoint } from '../calibrate/path.ts';
import { formatSummary, frameRecord, frameSummary, offsetsRecord, offsetsSummary } from '../calibrate/report.ts';
import { numberArg, readRunInputs, runCommand } from './run-command.ts';
import { pathArg } from './user-dir.ts';
import { EchotrailError } from '../errors.ts';
import { readFile } from 'node:fs/promises';
import { z } from 'zod';

const DEG = Math.PI / 180;

const reflector = (v: string, prev: ReflectorPosition[] = []): ReflectorPosition[] => {
  const [x, y, label, from, to] = v.split(',');
  const p: ReflectorPosition = { x: Number(x), y: Number(y), ...(label ? { label } : {}), ...(from ? { fromS: Number(from) } : {}), ...(to ? { toS: Number(to) } : {}) };
  if (!Number.isFinite(p.x) || !Number.isFinite(p.y) || (from && !Number.isFinite(p.fromS)) || (to && !Number.isFinite(p.toS))) throw new InvalidArgumentError('expected x,y[,label[,from_s,to_s]] in metres and seconds, e.g. 0.5,1.5,A');
  return [...prev, p];
};

const positionsSchema = z.array(z.object({ x: z.number().finite(), y: z.number().finite(), label: z.string().optional(), fromS: z.number().optional(), toS: z.number().optional() }).strict()).min(1);

async function readPositions(path: string): Promise<ReflectorPosition[]> {
  let json: unknown;
  try {
    json = JSON.parse(await readFile(path, 'utf8'));
  } catch (err) {
    throw new EchotrailError('E_OPTION', `cannot read reflector positions from ${path}: ${(err as Error).message}`, { cause: err });
  }
  const r = positionsSchema.safeParse(json);
  if (!r.success) throw new EchotrailError('E_OPTION', `${path}: ${r.error.issues[0].path.join('.') || '(top level)'}: ${r.error.issues[0].message}`);
  return r.data;
}

function common(cmd: Command): Command {
  return cmd
    .option('--calibration <file>', 'calibration file (JSON) to read and update, created when missing; the bench config\'s "calibration" entry points npm start at it', pathArg, 'calibration.json')
    .option('--by <who>', 'who or what measured it, stored in the config history', process.env.USER ?? 'unknown')
    .option('--dry-run', 'fit and print, save nothing');
}

function offsetsCommand(): Command {
  return common(new Command('echotrail calibrate offsets'))
    .description(`Fit range offset, range scale and azimuth offset from detections of a reflector at tape-measured positions (radar frame: x across, y along the antenna zero, metres). Each position must be seen in at least ${MIN_REVOLUTIONS_PER_SPOT} antenna revolutions (or ${MIN_STARING_S_PER_SPOT} s of a staring antenna). Each is checked against what the others alone predict (leave-one-out): ⚠ marks one that disagrees with them, ? spots that disagree when too few to tell which is wrong.`)
    .option('--detections <file>', 'detections CSV of the calibration run(s) (time_s,azimuth_deg,range_m,amplitude)', pathArg)
    .option('--session <file>', 'or a recorded session (its raw detections are used)', pathArg)
    .option('--reflector <x,y,…>', 'a tape-measured position x,y[,label[,from_s,to_s]], metres; repeat for each; from/to limit it to a time span, s', reflector)
    .option('--reflectors <file.json>', 'or a JSON array of positions: [{ "x": 0.5, "y": 1.5, "label": "A", "fromS": 0, "toS": 60 }, …] (metres, seconds)', pathArg)
    .option('--fit-scale <mode>', 'auto (when distances span ≥ 0.5 m), yes or no', 'auto')
    .option('--gate-range <m>', 'first range gate around each position, metres', numberArg, 0.5)
    .option('--gate-azimuth <deg>', 'first azimuth gate around each position, degrees', numberArg, 10)
    .option('--save-flagged', 'save the fit even when a spot is flagged ⚠ as disagreeing with the others (by default it is printed but not saved: re-measure that spot, or leave it out)');
}

function frameCommand(): Command {
  return common(new Command('echotrail calibrate frame'))
    .description('Fit the positioner frame (rotation + translation into the radar frame) from a run and its commanded path.')
    .option('--commanded <file>', 'commanded path CSV, positioner frame (time_s,x_m,y_m[,target_id]); default with --session: the session\'s own', pathArg)
    .option('--target-id <n>', 'which target of a multi-target commanded file', numberArg)
    .option('--detections <file>', 'detections CSV of the run (corrected with the config\'s offsets, gated around the path)', pathArg)
    .option('--session <file>', 'or a recorded session: its detections and commanded path', pathArg)
    .option('--tracks <file>', 'or a tracks CSV from echotrail track (time_s,track_id,x_m,y_m): the longest track is used', pathArg)
    .option('--track-id <n>', 'use this track id instead of the longest', numberArg)
    .option('--gate <m>', 'first gate radius around the path as currently aligned, metres', numberArg, 0.5)
    .option('--allow-line', 'accept a straight commanded path (tracking lag then shifts the translation along it)');
}

/** A verdict's mark on a spot's leave-one-out figure: as the dashboard's residual table marks it. */
const mark = (flagged: boolean, verdict: string) => (flagged ? ' ⚠' : verdict === 'disagree' ? ' ?' : '');

/**
 * One spot: its residuals against the fit (mean ± std of its detections) and, leave-one-out,
 * against what the other spots alone predict (± std), the figure its verdict rests on.
 */
function spotLine(r: ReflectorResidual): string {
  const flags = spotFlags(r);
  const vsRange = r.deletedRangeResidualM === null || r.deletedRangeSdM === null ? '—' : `${fixedWithMinus(r.deletedRangeResidualM * 1000, 1)} ± ${(r.deletedRangeSdM * 1000).toFixed(1)} mm`;
  const vsAzimuth = r.deletedAzimuthResidualRad === null || r.deletedAzimuthSdRad === null ? '—' : `${fixedWithMinus(r.deletedAzimuthResidualRad / DEG, 3)} ± ${(r.deletedAzimuthSdRad / DEG).toFixed(3)}°`;
  return `  ${r.label}: ${r.detections} detections at ${r.trueRangeM.toFixed(3)} m, residual range ${fixedWithMinus(r.meanRangeResidualM * 1000, 1)} ± ${(r.stdRangeResidualM * 1000).toFixed(1)} mm, azimuth ${fixedWithMinus(r.meanAzimuthResidualRad / DEG, 3)} ± ${(r.stdAzimuthResidualRad / DEG).toFixed(3)}°; `
    + `vs. the other spots: range ${vsRange}${mark(flags.range, r.rangeVerdict)}, azimuth ${vsAzimuth}${mark(flags.azimuth, r.azimuthVerdict)}\n`;
}

async function offsets(o: Record<string, unknown>): Promise<number> {
  const positions = [...((o.reflector as ReflectorPosition[] | undefined) ?? []), ...(o.reflectors ? await readPositions(o.reflectors as string) : [])];
  if (positions.length === 0) throw new EchotrailError('E_OPTION', 'give at least one --reflector x,y (tape-measured, metres)');
  const mode = String(o.fitScale);
  if (!['auto', 'yes', 'no'].includes(mode)) throw new EchotrailError('E_OPTION', `--fit-scale must be auto, yes or no (got '${mode}')`);
  const config = await loadBenchConfig(o.calibration as string, true);
  const dets = (await readRunInputs(o, false, 'calibrate offsets')).detections;
  const fit = fitRadarOffsets(positions, dets, { fitScale: mode === 'auto' ? 'auto' : mode === 'yes', gateRangeM: o.gateRange as number, gateAzimuthDeg: o.gateAzimuth as number });
  process.stdout.write(formatSummary('radar offsets (measured = scale·true + offset):', offsetsSummary(fit)) + '\n');
  for (const r of fit.reflectors) process.stdout.write(spotLine(r));
  for (const w of fit.warnings) process.stderr.write(`echotrail calibrate offsets: warning: ${w}\n`);
  process.stdout.write(`tracker corrections (added to measurements): rangeOffsetM ${(-fit.rangeOffsetM).toFixed(4)}, azimuthOffsetDeg ${(-fit.azimuthOffsetRad / DEG).toFixed(3)}${fit.scaleFitted ? ' (the tracker has no range scale)' : ''}\n`);
  if (o.dryRun) return 0;
  // A spot named as taped wrong pulls the whole fit: saving it by default would put a wrong range
  // offset and scale on the bench with exit 0 (a review measured 8 cm and 3 % off from one spot).
  const flagged = fit.reflectors.filter((r) => { const f = spotFlags(r); return f.range || f.azimuth; }).map((r) => r.label);
  if (flagged.length && !o.saveFlagged) {
    throw new EchotrailError('E_CALIBRATION', `not saved: spot${flagged.length > 1 ? 's' : ''} ${flagged.join(', ')} disagree${flagged.length > 1 ? '' : 's'} with the others (⚠ above); re-measure ${flagged.length > 1 ? 'them' : 'it'} or leave ${flagged.length > 1 ? 'them' : 'it'} out and fit again, or give --save-flagged to save this fit anyway`);
  }
  const now = new Date().toISOString();
  const next = withCalibration(config, { radar: { ...config.radar, rangeOffsetM: fit.rangeOffsetM, rangeScale: fit.rangeScale, azimuthOffsetDeg: fit.azimuthOffsetRad / DEG } }, offsetsRecord(fit, o.by as string, now, positions.length));
  await saveBenchConfig(o.calibration as string, next);
  process.stdout.write(`saved to ${o.calibration as string}\n`);
  return 0;
}

async function frame(o: Record<string, unknown>): Promise<number> {
  const config = await loadBenchConfig(o.calibration as string, true);
  let commanded: TimedPoint[];
  let observed: TimedPoint[];
  let initial: { rotationRad: number; translation: { x: number; y: number } } | null = null;
  if (o.tracks) {
    if (typeof o.commanded !== 'string') throw new EchotrailError('E_OPTION', 'give --commanded PATH.csv with --tracks');
    commanded = await readPathCsv(o.commanded, { id: o.targetId as number | undefined });
    const byId = parseTracksById(await readFile(o.tracks as string, 'utf8'), o.tracks as string);
    const id = (o.trackId as number | undefined) ?? [...byId.entries()].sort((a, b) => b[1].length - a[1].length)[0][0];
    const t = byId.get(id);
    if (!t) throw new EchotrailError('E_OPTION', `no track ${id} in ${o.tracks as string} (ids: ${[...byId.keys()].slice(0, 10).join(', ')})`);
    observed = t;
  } else {
    const run = await readRunInputs(o, true, 'calibrate frame');
    commanded = run.commanded as TimedPoint[];
    observed = run.detections.map((d) => correctDetection(d, config)).map((d) => ({ timeS: d.timeS, x: d.rangeM * Math.sin(d.azimuthRad), y: d.rangeM * Math.cos(d.azimuthRad) }));
    initial = { rotationRad: config.positionerFrame.rotationDeg * DEG, translation: config.positionerFrame.translationM };
  }
  const fit = alignFrame(observed, commanded, { initial, gateM: o.gate as number, allowCollinear: Boolean(o.allowLine) });
  process.stdout.write(formatSummary('positioner → radar frame (p_radar = R·p + t, R counter-clockwise):', frameSummary(fit)) + '\n');
  for (const w of frameWarnings(fit)) process.stderr.write(`echotrail calibrate frame: warning: ${w}\n`);
  if (o.dryRun) return 0;
  const next = withCalibration(config, { positionerFrame: { rotationDeg: fit.rotationRad / DEG, translationM: fit.translation } }, frameRecord(fit, o.by as string, new Date().toISOString()));
  await saveBenchConfig(o.calibration as string, next);
  process.stdout.write(`saved to ${o.calibration as string}\n`);
  return 0;
}

export async function run(argv: string[]): Promise<number> {
  const [sub, ...rest] = argv;
  if (sub === 'offsets') return runCommand(offsetsCommand(), rest, offsets, 'calibrate offsets');
  if (sub === 'frame') return runCommand(frameCommand(), rest, frame, 'calibrate frame');
  const usage = 'usage: echotrail calibrate offsets|frame [options]   (echotrail calibrate <kind> --help for the options)\n';
  if (sub === '--help' || sub === '-h') {
    process.stdout.write(usage);
    return 0;
  }
  process.stderr.write(usage);
  return 2;
}
