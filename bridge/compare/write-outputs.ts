/**
 * Writes the comparison's files into one folder: summary.json, the CSV series and report.html.
 * Every file is written under a temporary name first and the set renamed into place only when all
 * were written (atomic-file.ts), so a failure (full disk, no permission) leaves the previous report whole.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { writeAtomically } from '../atomic-file.ts';
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
  const finals = files.map(([name]) => join(dir, name));
  return writeAtomically(finals, async (tmps) => {
    for (let i = 0; i < files.length; i++) {
      try {
        await writeFile(tmps[i], files[i][1]);
      } catch (err) {
        throw new EchotrailError('E_PATH', `cannot write '${finals[i]}': ${(err as Error).message}`, { cause: err });
      }
    }
    return finals;
  });
}
