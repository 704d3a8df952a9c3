/**
 * Loads a detections CSV (the `track` input format of ../shared/conventions.md) for replay.
 *
 * Interim loader: bridge/ingest/detections-csv.ts (another part of the project) is the
 * reference reader; until it is committed this minimal one reads plain, unquoted CSV:
 * header row, columns time_s, azimuth_deg, range_m, amplitude in any order, others ignored.
 * Malformed rows are refused with their line number; the good rows around them are kept.
 */
import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import { EchotrailError } from '../errors.ts';
import type { Detection } from '../types.ts';
import type { BadLine } from './source.ts';

export interface LoadedDetections {
  detections: Detection[];
  bad: BadLine[];
}

const REQUIRED = ['time_s', 'azimuth_deg', 'range_m', 'amplitude'] as const;
const DEG = Math.PI / 180;

export async function loadDetectionsForReplay(path: string): Promise<LoadedDetections> {
  const rl = createInterface({ input: createReadStream(path, { encoding: 'utf8' }), crlfDelay: Infinity });
  const detections: Detection[] = [];
  const bad: BadLine[] = [];
  let cols: number[] | null = null;
  let lineNo = 0;
  let lastT = -Infinity;
  try {
    for await (const text of rl) {
      lineNo++;
      if (text.trim() === '') continue;
      const cells = text.split(',').map((c) => c.trim());
      if (!cols) {
        const names = cells.map((c) => c.toLowerCase());
        const idx = REQUIRED.map((r) => names.indexOf(r));
        const missing = REQUIRED.filter((_, i) => idx[i] < 0);
        if (missing.length) throw new EchotrailError('E_INPUT_COLUMNS', `${path}: line ${lineNo}: missing column(s) ${missing.join(', ')}; the header needs ${REQUIRED.join(',')}`);
        cols = idx;
        continue;
      }
      const v = cols.map((i) => (cells[i] !== undefined && cells[i] !== '' ? Number(cells[i]) : NaN));
      const reason =
        v.some((x) => !Number.isFinite(x)) ? 'a required value is missing or not a number'
        : v[0] < lastT ? `time_s ${v[0]} goes back in time`
        : v[1] < 0 || v[1] >= 360 ? `azimuth_deg ${v[1]} outside [0, 360)`
        : v[2] < 0 ? 'range_m is negative'
        : v[3] <= 0 ? 'amplitude is not positive'
        : null;
      if (reason) {
        bad.push({ line: lineNo, reason, text: text.slice(0, 200) });
        continue;
      }
      lastT = v[0];
      detections.push({ timeS: v[0], azimuthRad: v[1] * DEG, rangeM: v[2], amplitude: v[3], line: lineNo });
    }
  } catch (err) {
    if (err instanceof EchotrailError) throw err;
    throw new EchotrailError('E_INPUT_EMPTY', `cannot read '${path}': ${(err as Error).message}`, { cause: err });
  }
  if (!cols) throw new EchotrailError('E_INPUT_EMPTY', `${path}: no header row; a detections CSV starts with ${REQUIRED.join(',')}`);
  return { detections, bad };
}
