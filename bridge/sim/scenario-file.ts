/**
 * Scenario files: the JSON form of ScenarioOptions (see scenario.ts), validated with zod so that a
 * typo in a file gives a message naming the field instead of a silent default.
 */
import { readFile } from 'node:fs/promises';
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';
import type { ScenarioOptions } from './scenario.ts';

const point = z.object({ x: z.number(), y: z.number() });
const finite = z.number().finite();
const positive = z.number().positive();
const prob = z.number().min(0).max(1);

const trajectory = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('static'), at: point }),
  z.object({ kind: z.literal('line'), from: point, to: point, speedMps: positive, accelMps2: positive.optional(), startS: finite.optional() }),
  z.object({ kind: z.literal('circle'), center: point, radiusM: positive, periodS: positive, startAngleDeg: finite.optional(), clockwise: z.boolean().optional() }),
  z.object({ kind: z.literal('figure-eight'), center: point, widthM: positive, heightM: positive, periodS: positive, rotationDeg: finite.optional() }),
  z.object({
    kind: z.literal('rail'), from: point, to: point, speedMps: positive, dwellS: z.number().min(0).optional(), accelMps2: positive.optional(),
    stops: z.array(z.object({ at: z.number().gt(0).lt(1), dwellS: z.number().min(0) })).optional(),
  }),
  z.object({ kind: z.literal('profile'), start: point, headingDeg: finite, speedMps: finite.optional(), segments: z.array(z.object({ durationS: positive, accelMps2: finite })) }),
  z.object({
    kind: z.literal('waypoints'), speedMps: positive, accelMps2: positive.optional(), loop: z.boolean().optional(),
    points: z.array(z.object({ x: finite, y: finite, speedMps: positive.optional(), dwellS: z.number().min(0).optional() })).min(1),
  }),
]);

export const scenarioSchema = z.object({
  /** Format version of scenario files; only 1 exists. */
  version: z.literal(1).optional(),
  name: z.string().optional(),
  description: z.string().optional(),
  durationS: positive.optional(),
  seed: z.number().int().optional(),
  antenna: z
    .discriminatedUnion('mode', [
      z.object({ mode: z.literal('rotating'), periodS: positive.optional(), startAzimuthDeg: finite.optional() }),
      z.object({ mode: z.literal('staring'), rateHz: positive.optional(), centerAzimuthDeg: finite.optional(), sectorDeg: positive.max(360).optional() }),
    ])
    .optional(),
  minRangeM: z.number().min(0).optional(),
  maxRangeM: positive.optional(),
  sigmaRangeM: z.number().min(0).optional(),
  sigmaAzimuthDeg: z.number().min(0).optional(),
  pd: prob.optional(),
  falseAlarmRateHz: z.number().min(0).optional(),
  targets: z.array(z.object({ id: z.number().int().optional(), trajectory, pd: prob.optional(), rcsM2: positive.optional() })).optional(),
  fixedEchoes: z.array(z.object({ x: finite, y: finite, pd: prob.optional(), rcsM2: positive.optional(), label: z.string().optional() })).optional(),
  walls: z.array(z.object({ from: point, to: point, spacingM: positive.optional(), pd: prob.optional(), rcsM2: positive.optional() })).optional(),
  rangeOffsetM: finite.optional(),
  rangeScale: positive.optional(),
  azimuthOffsetDeg: finite.optional(),
  frameRotationDeg: finite.optional(),
  frameTranslation: point.optional(),
  referenceAmplitude: positive.optional(),
  noiseAmplitude: z.number().min(0).optional(),
  fluctuating: z.boolean().optional(),
  truthRateHz: positive.optional(),
  positionerLagS: z.number().min(0).optional(),
  phase: z.object({ prfHz: positive, wavelengthM: positive.optional(), sigmaDeg: z.number().min(0).optional() }).strict().optional(),
}).strict();

/** Validates parsed JSON as a scenario; throws E_OPTION naming the first bad field. */
export function parseScenario(json: unknown, where = 'scenario'): ScenarioOptions {
  const r = scenarioSchema.safeParse(json);
  if (!r.success) {
    const issue = r.error.issues[0];
    throw new EchotrailError('E_OPTION', `${where}: ${issue.path.join('.') || '(top level)'}: ${issue.message}`);
  }
  const { version: _version, ...options } = r.data;
  return options satisfies ScenarioOptions;
}

/** Reads and validates a scenario JSON file. */
export async function loadScenarioFile(path: string): Promise<ScenarioOptions> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot read scenario file ${path}: ${(err as Error).message}`, { cause: err });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new EchotrailError('E_OPTION', `scenario file ${path} is not valid JSON: ${(err as Error).message}`, { cause: err });
  }
  return parseScenario(json, path);
}
