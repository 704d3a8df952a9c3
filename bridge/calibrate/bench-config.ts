/**
 * The bench configuration file: what calibration found about this bench, versioned, with a
 * history of who or what measured each value and when. JSON at the edge of the program, so angles
 * are degrees and named so. Example:
 *
 *     { "version": 1, "bench": "bay 3", "updatedUtc": "2026-12-02T02:10:00.000Z",
 *       "radar": { "rangeOffsetM": 0.118, "rangeScale": 1, "azimuthOffsetDeg": 1.97 },
 *       "positionerFrame": { "rotationDeg": 3.02, "translationM": { "x": 0.05, "y": -0.08 } },
 *       "history": [{ "kind": "offsets", "dateUtc": "…", "measuredBy": "A. Tech, tape + run 14", … }] }
 *
 * `radar` holds the radar's errors as measured (measured range = scale·true + offset; measured
 * azimuth = true + offset); `trackerCorrections()` turns them into the tracker's additive offsets.
 * `positionerFrame` maps positioner coordinates into the radar frame: p_radar = R·p + t, R
 * counter-clockwise.
 */
import { readFile, rename, writeFile } from 'node:fs/promises';
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';

const DEG = Math.PI / 180;

const historyEntry = z.object({
  /** What was calibrated. */
  kind: z.enum(['offsets', 'frame', 'noise', 'manual']),
  /** When, ISO 8601 UTC. */
  dateUtc: z.string().datetime(),
  /** Who or what measured it (person, tool, run name). */
  measuredBy: z.string().min(1),
  /** How: method and inputs in words. */
  method: z.string(),
  /** The numbers found, with their standard errors, flat. */
  result: z.record(z.string(), z.number()),
  note: z.string().optional(),
});

export const benchConfigSchema = z
  .object({
    version: z.literal(1),
    /** Name of the bench. */
    bench: z.string().min(1),
    /** Last change, ISO 8601 UTC. */
    updatedUtc: z.string().datetime(),
    radar: z.object({
      rangeOffsetM: z.number().finite(),
      rangeScale: z.number().positive(),
      azimuthOffsetDeg: z.number().finite(),
      sigmaRangeM: z.number().positive().optional(),
      sigmaAzimuthDeg: z.number().positive().optional(),
    }).strict(),
    positionerFrame: z.object({ rotationDeg: z.number().finite(), translationM: z.object({ x: z.number().finite(), y: z.number().finite() }).strict() }).strict(),
    history: z.array(historyEntry),
  })
  .strict();

export type BenchConfig = z.infer<typeof benchConfigSchema>;
export type CalibrationRecord = z.infer<typeof historyEntry>;

/** A bench with nothing calibrated yet: no errors, identity frame. */
export function defaultBenchConfig(bench = 'bench', now = new Date()): BenchConfig {
  return { version: 1, bench, updatedUtc: now.toISOString(), radar: { rangeOffsetM: 0, rangeScale: 1, azimuthOffsetDeg: 0 }, positionerFrame: { rotationDeg: 0, translationM: { x: 0, y: 0 } }, history: [] };
}

/** Validates parsed JSON; the message names the field. */
export function parseBenchConfig(json: unknown, name = 'bench config'): BenchConfig {
  const r = benchConfigSchema.safeParse(json);
  if (!r.success) {
    const i = r.error.issues[0];
    throw new EchotrailError('E_OPTION', `${name}: ${i.path.join('.') || '(top level)'}: ${i.message} (format: bridge/calibrate/bench-config.ts)`);
  }
  return r.data;
}

/** Reads a bench config; a missing file gives the default when `orDefault` is set, else E_PATH. */
export async function loadBenchConfig(path: string, orDefault = false): Promise<BenchConfig> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    if (orDefault && (err as NodeJS.ErrnoException).code === 'ENOENT') return defaultBenchConfig();
    throw new EchotrailError('E_PATH', `cannot read bench config ${path}: ${(err as Error).message}`, { cause: err });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new EchotrailError('E_OPTION', `bench config ${path} is not valid JSON: ${(err as Error).message}`, { cause: err });
  }
  return parseBenchConfig(json, `bench config ${path}`);
}

/** Writes atomically (temporary file, then rename) so a crash never leaves half a file. */
export async function saveBenchConfig(path: string, config: BenchConfig): Promise<void> {
  const valid = parseBenchConfig(config);
  const tmp = `${path}.${process.pid}.tmp`;
  try {
    await writeFile(tmp, JSON.stringify(valid, null, 2) + '\n');
    await rename(tmp, path);
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot write bench config ${path}: ${(err as Error).message}`, { cause: err });
  }
}

/** A new config with `change` applied, the record appended and the date updated (input untouched). */
export function withCalibration(config: BenchConfig, change: Partial<Pick<BenchConfig, 'radar' | 'positionerFrame'>>, record: CalibrationRecord): BenchConfig {
  return {
    ...config,
    radar: change.radar ? { ...config.radar, ...change.radar } : config.radar,
    positionerFrame: change.positionerFrame ?? config.positionerFrame,
    updatedUtc: record.dateUtc,
    history: [...config.history, record],
  };
}

/** The tracker's additive corrections (bridge/tracking/measurement.ts adds them to what it measures). */
export function trackerCorrections(config: BenchConfig): { rangeOffsetM: number; azimuthOffsetRad: number } {
  return { rangeOffsetM: -config.radar.rangeOffsetM, azimuthOffsetRad: -config.radar.azimuthOffsetDeg * DEG };
}

/** Undoes the radar's errors on one detection: true range = (measured − offset)/scale. */
export function correctDetection<T extends { rangeM: number; azimuthRad: number }>(d: T, config: BenchConfig): T {
  const az = d.azimuthRad - config.radar.azimuthOffsetDeg * DEG;
  const tp = 2 * Math.PI;
  return { ...d, rangeM: (d.rangeM - config.radar.rangeOffsetM) / config.radar.rangeScale, azimuthRad: ((az % tp) + tp) % tp };
}

/** Maps positioner-frame points (a commanded path) into the radar frame with the bench's frame. */
export function positionerToRadarFrame<T extends { x: number; y: number }>(points: T[], config: BenchConfig): T[] {
  const a = config.positionerFrame.rotationDeg * DEG;
  const c = Math.cos(a);
  const s = Math.sin(a);
  const { x: tx, y: ty } = config.positionerFrame.translationM;
  return points.map((p) => ({ ...p, x: c * p.x - s * p.y + tx, y: s * p.x + c * p.y + ty }));
}
