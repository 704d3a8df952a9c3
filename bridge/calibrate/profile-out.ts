/**
 * Writes what tuning found as a named tracker profile in the tracking module's own format
 * (bridge/tracking/profile.ts, validated with its schema before anything is written).
 */
import { mkdir, rename, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { EchotrailError } from '../errors.ts';
import { parseTrackerProfile, type TrackerProfile } from '../tracking/profile.ts';
import type { BenchConfig } from './bench-config.ts';
import type { NoiseTuningResult } from './noise-tuning.ts';

const DEG = Math.PI / 180;
const NAME = /^[A-Za-z0-9][A-Za-z0-9._-]{0,63}$/;

export interface ProfileMeta {
  /** Profile name: letters, digits, '.', '_' or '-', becomes the file name. */
  name: string;
  /** Who or what ran the tuning. */
  measuredBy: string;
  /** The run it was tuned on (file or session name). */
  run: string;
  /** When, ISO 8601 UTC. */
  dateUtc: string;
}

/** Where a named profile lives under `dir` (default `profiles/`). */
export function profilePath(name: string, dir = 'profiles'): string {
  if (!NAME.test(name)) throw new EchotrailError('E_OPTION', `profile name '${name}' must be 1–64 letters, digits, '.', '_' or '-', starting with a letter or digit`);
  return join(dir, `${name}.json`);
}

/**
 * The profile: tuned noise and process noise, and the bench's offsets as the tracker's additive
 * corrections. The tracker has no range scale; a scale that differs from 1 is listed in `warnings`.
 */
export function tunedProfile(result: NoiseTuningResult, config: BenchConfig, meta: ProfileMeta): { profile: TrackerProfile; warnings: string[] } {
  const warnings: string[] = [];
  if (Math.abs(config.radar.rangeScale - 1) > 1e-4) warnings.push(`the bench's range scale ${config.radar.rangeScale.toFixed(5)} cannot be expressed in a tracker profile (offset only); ranges far from the calibration distances will be off by (scale − 1)·r`);
  if (!result.bracketed) warnings.push(`the process-noise search ended at its limit (${result.nisTuned.verdict}); check the run and the noise figures`);
  const f = result.filter;
  const profile = parseTrackerProfile({
    version: 1,
    description: `${meta.name}: tuned ${meta.dateUtc} by ${meta.measuredBy} from ${meta.run} on bench '${config.bench}'; mean NIS ${result.nisTuned.mean.toFixed(2)} over ${result.nisTuned.count} updates`,
    measurement: {
      sigmaRangeM: result.sigmaRangeM,
      sigmaAzimuthDeg: result.sigmaAzimuthRad / DEG,
      rangeOffsetM: -config.radar.rangeOffsetM,
      azimuthOffsetDeg: -config.radar.azimuthOffsetDeg,
    },
    filter: f.kind === 'kalman' ? { kind: 'kalman', sigmaAccel: f.sigmaAccel } : { kind: 'imm', sigmaLow: f.sigmaLow, sigmaHigh: f.sigmaHigh },
  }, `profile ${meta.name}`);
  return { profile, warnings };
}

/** Writes a profile atomically, creating its folder. */
export async function saveTrackerProfile(path: string, profile: TrackerProfile): Promise<void> {
  const valid = parseTrackerProfile(profile, `profile ${path}`);
  try {
    await mkdir(dirname(path), { recursive: true });
    const tmp = `${path}.${process.pid}.tmp`;
    await writeFile(tmp, JSON.stringify(valid, null, 2) + '\n');
    await rename(tmp, path);
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot write profile ${path}: ${(err as Error).message}`, { cause: err });
  }
}
