/**
 * Writes the comparison's files into one folder: summary.json, the CSV series and report.html.
 * Every file is written under a temporary name first and the set renamed into place only when all
 * were written, so a failure (full disk, no permission) leaves the previous report whole.
 */
import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { EchotrailError } from '../errors.ts';
import type { Analysis } from './analyse.ts';
import { renderReport, type ReportOptions } from './report/html.ts';
import { buildSummary, lagCsv, roundForJson, seriesCsv, setsCsv, type SummaryMeta } from './summary.ts';

/** File names written, relative to the output folder. */
export const OUTPUT_FILES = {
  summary: 'summary.json',
  series: 'errors.csv',
  sets: 'ospa-gospa.csv',
  lag: 'lag-search.csv',
  report: 'report.html',
} as const;

/** Write every output; returns the paths written. */
export async function writeOutputs(dir: string, a: Analysis, meta: SummaryMeta, report: ReportOptions): Promise<string[]> {
  try {
    await mkdir(dir, { recursive: true });
  } catch (err) {
    throw new EchotrailError('E_OPTION', `cannot create output folder '${dir}': ${(err as Error).message}`, { cause: err });
  }
  const files: [string, string][] = [
    [OUTPUT_FILES.summary, JSON.stringify(buildSummary(a, meta), roundForJson, 2) + '\n'],
    [OUTPUT_FILES.series, seriesCsv(a)],
    [OUTPUT_FILES.sets, setsCsv(a)],
    [OUTPUT_FILES.lag, lagCsv(a)],
    [OUTPUT_FILES.report, renderReport(a, meta, report)],
  ];
  const tmp = (name: string) => join(dir, `.${name}.${process.pid}.tmp`);
  try {
    for (const [name, text] of files) {
      try {
        await writeFile(tmp(name), text);
      } catch (err) {
        throw new EchotrailError('E_PATH', `cannot write '${join(dir, name)}': ${(err as Error).message}`, { cause: err });
      }
    }
    const written: string[] = [];
    for (const [name] of files) {
      const p = join(dir, name);
      await rename(tmp(name), p).catch((err: Error) => {
        throw new EchotrailError('E_PATH', `cannot write '${p}': ${err.message}`, { cause: err });
      });
      written.push(p);
    }
    return written;
  } finally {
    // Left over only after a failure: renamed files are gone from these names.
    await Promise.all(files.map(([name]) => rm(tmp(name), { force: true }).catch(() => undefined)));
  }
}
