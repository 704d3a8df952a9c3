/**
 * Tracker profile: a JSON file of tracker options, written by hand or by the calibration and
 * tuning tools, read by `track --profile` and the live bridge.
 *
 * The file is at the edge of the program, so angles are in degrees and named so; everything else
 * is SI. Every field is optional: what a profile leaves out keeps its default (or what the
 * command line says). Example:
 *
 *     { "version": 1, "measurement": { "sigmaRangeM": 0.04, "sigmaAzimuthDeg": 1.2, "rangeOffsetM": -0.12 },
 *       "filter": { "kind": "imm" }, "gate": { "probability": 0.995 }, "initiation": { "m": 3, "n": 5 } }
 */
import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';
import type { TrackerOptionsInput } from './tracker-options.ts';

const DEG = Math.PI / 180;
const pos = z.number().positive();
const nonneg = z.number().nonnegative();

export const trackerProfileSchema = z
  .object({
    /** Format version; 1 is the only one so far. */
    version: z.literal(1),
    /** Free text: bench, date, who tuned it. */
    description: z.string().optional(),
    antenna: z.enum(['auto', 'rotating', 'staring']).optional(),
    intervalS: nonneg.optional(),
    estimateNoise: z.boolean().optional(),
    batchS: nonneg.optional(),
    reportStationary: z.boolean().optional(),
    measurement: z
      .object({
        conversion: z.enum(['linearised', 'unbiased']).optional(),
        sigmaRangeM: pos.optional(),
        sigmaAzimuthDeg: pos.optional(),
        rangeOffsetM: z.number().optional(),
        azimuthOffsetDeg: z.number().optional(),
      })
      .strict()
      .optional(),
    filter: z
      .object({
        kind: z.enum(['imm', 'kalman', 'alpha-beta']).optional(),
        processNoise: z.enum(['dwna', 'cwna']).optional(),
        sigmaAccel: pos.optional(),
        sigmaLow: pos.optional(),
        sigmaHigh: pos.optional(),
        sojournLowS: pos.optional(),
        sojournHighS: pos.optional(),
        alpha: z.number().gt(0).lt(1).optional(),
        beta: z.number().gt(0).lt(4).optional(),
      })
      .strict()
      .optional(),
    gate: z.object({ probability: z.number().gt(0).lt(1).optional() }).strict().optional(),
    initiation: z
      .object({ m: z.number().int().min(1).optional(), n: z.number().int().min(1).max(30).optional(), maxSpeedMps: pos.optional() })
      .strict()
      .optional(),
    deletion: z
      .object({ maxMisses: z.number().int().min(1).optional(), minCoastS: nonneg.optional(), maxPositionSigmaM: pos.optional() })
      .strict()
      .optional(),
    fixedEchoes: z
      .object({ enabled: z.boolean().optional(), afterS: nonneg.optional(), moveThresholdM: pos.optional(), forgetS: pos.optional() })
      .strict()
      .optional(),
  })
  .strict();

export type TrackerProfile = z.infer<typeof trackerProfileSchema>;

/** Profile (degrees at the edge) → tracker options (radians inside). */
export function profileToOptions(p: TrackerProfile): TrackerOptionsInput {
  const { version: _v, description: _d, measurement, ...rest } = p;
  const out: TrackerOptionsInput = { ...rest };
  if (measurement) {
    const { sigmaAzimuthDeg, azimuthOffsetDeg, ...m } = measurement;
    out.measurement = {
      ...m,
      ...(sigmaAzimuthDeg !== undefined ? { sigmaAzimuthRad: sigmaAzimuthDeg * DEG } : {}),
      ...(azimuthOffsetDeg !== undefined ? { azimuthOffsetRad: azimuthOffsetDeg * DEG } : {}),
    };
  }
  return out;
}

/** Validates parsed JSON as a profile; the message names the offending field. */
export function parseTrackerProfile(json: unknown, name = 'profile'): TrackerProfile {
  const r = trackerProfileSchema.safeParse(json);
  if (!r.success) {
    const i = r.error.issues[0];
    const where = i.path.length ? i.path.join('.') : '(top level)';
    throw new EchotrailError('E_OPTION', `${name}: ${where}: ${i.message} (see bridge/tracking/profile.ts for the format)`);
  }
  return r.data;
}

/** Reads and validates a profile file; returns the tracker options it stands for. */
export async function loadTrackerProfile(path: string): Promise<TrackerOptionsInput> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot read profile ${path}: ${(err as Error).message}`, { cause: err });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new EchotrailError('E_OPTION', `profile ${path} is not valid JSON: ${(err as Error).message}`, { cause: err });
  }
  return profileToOptions(parseTrackerProfile(json, `profile ${path}`));
}
