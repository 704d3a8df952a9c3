/**
 * `echotrail tune`: from a recorded run and its commanded path, estimates σ_range, σ_azimuth and
 * the process noise that makes the filter consistent (NIS), prints the innovation statistics and
 * writes a named tracker profile (bridge/tracking/profile.ts format) for `track --profile`.
 */
import { Command } from 'commander';
import { loadBenchConfig, saveBenchConfig, withCalibration } from '../calibrate/bench-config.ts';
import { describeNis } from '../calibrate/nis.ts';
import { tuneNoise } from '../calibrate/noise-tuning.ts';
import type { TimedPoint } from '../calibrate/path.ts';
import { profilePath, saveTrackerProfile, tunedProfile } from '../calibrate/profile-out.ts';
import { noiseRecord } from '../calibrate/report.ts';
import { numberArg, readRunInputs, runCommand } from './run-command.ts';
import { pathArg } from './user-dir.ts';
import { EchotrailError } from '../errors.ts';

const DEG = Math.PI / 180;

function command(): Command {
  return new Command('echotrail tune')
    .description('Estimate measurement and process noise from a run with a known commanded path and write a tracker profile.')
    .option('--detections <file>', 'detections CSV of the run (time_s,azimuth_deg,range_m,amplitude)', pathArg)
    .option('--commanded <file>', 'commanded path CSV, positioner frame (time_s,x_m,y_m[,target_id]); default with --session: the session\'s own', pathArg)
    .option('--session <file>', 'or a recorded session: its raw detections and commanded path', pathArg)
    .option('--target-id <n>', 'which target of a multi-target commanded file', numberArg)
    .requiredOption('--name <name>', 'profile name (letters, digits, . _ -): written to <profile-dir>/<name>.json')
    .option('--profile-dir <dir>', 'folder of tracker profiles', pathArg, 'profiles')
    .option('--calibration <file>', 'calibration file with offsets and frame: read, then written back with the tuned noise and a history entry (created if missing; not with --dry-run)', pathArg, 'calibration.json')
    .option('--filter <kind>', 'filter to tune: kalman (σ_a, m/s²) or imm (both levels scaled)', 'kalman')
    .option('--gate <m>', 'association radius around the commanded position, metres', numberArg, 0.4)
    .option('--keep-fixed-echoes', 'also take detections that lie on the run\'s fixed echoes (left out by default: a mount near the path would count as noise)')
    .option('--by <who>', 'who or what tuned it, stored in the profile and the config history', process.env.USER ?? 'unknown')
    .option('--dry-run', 'estimate and print, write nothing');
}

async function body(o: Record<string, unknown>): Promise<number> {
  const filter = String(o.filter);
  if (filter !== 'kalman' && filter !== 'imm') throw new EchotrailError('E_OPTION', `--filter must be kalman or imm (got '${filter}')`);
  const path = profilePath(o.name as string, o.profileDir as string);
  const config = await loadBenchConfig(o.calibration as string, true);
  const run = await readRunInputs(o, true, 'tune');
  const r = tuneNoise(run.detections, run.commanded as TimedPoint[], config, { filter, gateM: o.gate as number, skipFixedEchoes: !o.keepFixedEchoes });
  const ci = (v: [number, number], k = 1) => `[${(v[0] * k).toFixed(4)}, ${(v[1] * k).toFixed(4)}]`;
  const lines = [
    `associated detections: ${r.samples}` + (r.onFixedEchoes ? ` (${r.onFixedEchoes} more within the gate ${r.onFixedEchoes === 1 ? 'lies' : 'lie'} on the run's fixed echoes (${r.fixedEchoes} learned) and ${r.onFixedEchoes === 1 ? 'was' : 'were'} left out)` : ''),
    `σ_range    ${r.sigmaRangeM.toFixed(4)} m   95% CI ${ci(r.sigmaRangeCiM)} m   (bias ${(r.rangeBiasM * 1000).toFixed(1)} mm)`,
    `σ_azimuth  ${(r.sigmaAzimuthRad / DEG).toFixed(4)}°   95% CI ${ci(r.sigmaAzimuthCiRad, 1 / DEG)}°   (bias ${(r.azimuthBiasRad / DEG).toFixed(3)}°)`,
    `process noise: ${JSON.stringify(r.filter)}`,
    `tuned:    ${describeNis(r.nisTuned)}`,
    `defaults: ${describeNis(r.nisDefault)}`,
    // The tuned figure is measured on the run it was tuned on, so it is consistent by
    // construction: only another run can confirm the profile.
    `(the tuned NIS is measured on this same run; check the profile on another run: echotrail track --profile …, then compare)`,
  ];
  process.stdout.write(lines.join('\n') + '\n');
  const now = new Date().toISOString();
  const { profile, warnings } = tunedProfile(r, config, { name: o.name as string, measuredBy: o.by as string, run: run.name, dateUtc: now });
  for (const w of warnings) process.stderr.write(`warning: ${w}\n`);
  if (o.dryRun) return 0;
  await saveTrackerProfile(path, profile);
  await saveBenchConfig(o.calibration as string, withCalibration(config, { radar: { ...config.radar, sigmaRangeM: r.sigmaRangeM, sigmaAzimuthDeg: r.sigmaAzimuthRad / DEG } }, noiseRecord(r, o.by as string, now)));
  process.stdout.write(`profile written to ${path}; use: echotrail track --profile ${path}\n`);
  process.stdout.write(`noise figures and a history entry written to ${o.calibration as string}\n`);
  return 0;
}

export async function run(argv: string[]): Promise<number> {
  return runCommand(command(), argv, body, 'tune');
}
