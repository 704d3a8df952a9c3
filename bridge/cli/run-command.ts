/**
 * Shared pieces of the `calibrate` and `tune` commands, on the CLI side: parsing with exit codes,
 * errors in the common `echotrail <command>: E_CODE: message` shape (report-error.ts), and the
 * run inputs with the full skipped-row report.
 */
import { CommanderError, InvalidArgumentError, type Command } from 'commander';
import { readPathCsv, type TimedPoint } from '../calibrate/path.ts';
import { readSessionRun } from '../calibrate/session-input.ts';
import { EchotrailError } from '../errors.ts';
import { formatSkipDetails, formatSkipReport, formatWrapNote, readDetectionsCsv } from '../ingest/detections-csv.ts';
import type { Detection } from '../types.ts';
import { reportError } from './report-error.ts';

/** Commander argument parser for a finite number. */
export const numberArg = (v: string): number => {
  const n = Number(v);
  if (v.trim() === '' || !Number.isFinite(n)) throw new InvalidArgumentError('not a number');
  return n;
};

/** All detections of a (calibration-sized) CSV, with the skipped-row report on stderr. */
export async function readAllDetections(path: string, command: string): Promise<Detection[]> {
  const reader = readDetectionsCsv(path);
  const out: Detection[] = [];
  for await (const batch of reader.batches()) for (const d of batch) out.push(d);
  const skipped = formatSkipReport(reader.report);
  if (skipped) process.stderr.write(`echotrail ${command}: ${path}: ${skipped}\n`);
  for (const l of formatSkipDetails(reader.report)) process.stderr.write(`echotrail ${command}:   ${l}\n`);
  const wrapped = formatWrapNote(reader.report);
  if (wrapped) process.stderr.write(`echotrail ${command}: ${path}: ${wrapped}\n`);
  return out;
}

/** Parses a command, runs it, and maps errors to exit codes: 0 ok, 1 unusable input, 2 usage. */
export async function runCommand(cmd: Command, argv: string[], body: (opts: Record<string, unknown>) => Promise<number>, name: string): Promise<number> {
  cmd.exitOverride().configureOutput({ writeOut: (s) => process.stdout.write(s), writeErr: (s) => process.stderr.write(s) });
  try {
    cmd.parse(argv, { from: 'user' });
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode === 0 ? 0 : 2;
    return reportError(name, err, 2);
  }
  try {
    return await body(cmd.opts());
  } catch (err) {
    return reportError(name, err);
  }
}

/**
 * Detections and (when `needPath`) the commanded path of a run: from --session, or from
 * --detections and --commanded (a --commanded file also overrides the session's own path).
 */
export async function readRunInputs(o: Record<string, unknown>, needPath: boolean, command: string): Promise<{ detections: Detection[]; commanded: TimedPoint[] | null; name: string }> {
  let detections: Detection[];
  let commanded: TimedPoint[] | null = null;
  let name: string;
  if (typeof o.session === 'string') {
    const s = await readSessionRun(o.session);
    for (const w of s.warnings) process.stderr.write(`echotrail ${command}: warning: ${w}\n`);
    detections = s.detections;
    commanded = s.commanded;
    name = o.session;
  } else if (typeof o.detections === 'string') {
    detections = await readAllDetections(o.detections, command);
    name = o.detections;
  } else throw new EchotrailError('E_OPTION', 'give --detections FILE.csv or --session FILE');
  if (typeof o.commanded === 'string') commanded = await readPathCsv(o.commanded, { id: o.targetId as number | undefined });
  if (needPath && !commanded) throw new EchotrailError('E_OPTION', `${name} has no commanded path: give --commanded PATH.csv (time_s,x_m,y_m)`);
  return { detections, commanded, name };
}
