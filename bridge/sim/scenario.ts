/**
 * What a simulated bench run is made of, and `resolveScenarioOptions()`, the one place where
 * defaults are filled in and degrees become radians. Options are plain JSON (scenario files).
 *
 * Frames: trajectories are given in the positioner's frame; the radar sees
 * p_radar = R(rotation)·p_positioner + translation, R a counter-clockwise rotation of the x–y
 * plane (positive turns +x towards +y). Fixed echoes are given in the radar frame.
 */
import { EchotrailError } from '../errors.ts';
import type { Point, TrajectorySpec } from './trajectories.ts';

export type AntennaOptions =
  | {
      mode: 'rotating';
      /** Revolution period, s (default 1). */
      periodS?: number;
      /** Azimuth of the beam at t = 0, degrees clockwise from +y (default 0). */
      startAzimuthDeg?: number;
    }
  | {
      mode: 'staring';
      /** Detections per second per reflector in the beam, Hz (default 200). */
      rateHz?: number;
      /** Beam centre, degrees clockwise from +y (default 0). */
      centerAzimuthDeg?: number;
      /** Full width of the covered sector, degrees (default 60). */
      sectorDeg?: number;
    };

export interface TargetOptions {
  /** Target id used in truth and commanded outputs (default: 1-based index). */
  id?: number;
  /** Commanded motion, positioner frame. */
  trajectory: TrajectorySpec;
  /** Probability of detection per look (default: the scenario's pd). */
  pd?: number;
  /** Radar cross-section, m² (default 0.025, a 5 cm trihedral corner at X-band). */
  rcsM2?: number;
}

export interface FixedEchoOptions {
  /** Position in the radar frame, m. */
  x: number;
  y: number;
  /** Probability of detection per look (default 0.98). */
  pd?: number;
  /** Radar cross-section, m² (default 0.05). */
  rcsM2?: number;
  /** What it is (cable joint, mount...), for people reading the scenario. */
  label?: string;
}

export interface WallOptions {
  /** Ends of the wall, radar frame, m. */
  from: Point;
  to: Point;
  /** Spacing of the point reflectors that stand for the wall, m (default 0.3). */
  spacingM?: number;
  /** Probability of detection per look of each point (default 0.9). */
  pd?: number;
  /** Radar cross-section of each point, m² (default 0.2). */
  rcsM2?: number;
}

export interface ScenarioOptions {
  /** Short name, shown by `simulate --list`. */
  name?: string;
  /** One line on what the run exercises. */
  description?: string;
  /** Run length, s (default 60). */
  durationS?: number;
  /** PRNG seed (default 1). */
  seed?: number;
  /** Antenna behaviour (default rotating, 1 s). */
  antenna?: AntennaOptions;
  /** Instrumented range interval, m (default 0.3–8). */
  minRangeM?: number;
  maxRangeM?: number;
  /** Measurement noise std: range in m (default 0.05), azimuth in degrees (default 1.5). */
  sigmaRangeM?: number;
  sigmaAzimuthDeg?: number;
  /** Default probability of detection of targets (default 0.95). */
  pd?: number;
  /** Mean number of false alarms per second over the whole coverage (default 0.5). */
  falseAlarmRateHz?: number;
  /** Moving reflectors. */
  targets?: TargetOptions[];
  /** Stationary reflectors. */
  fixedEchoes?: FixedEchoOptions[];
  /** Walls, turned into rows of stationary reflectors. */
  walls?: WallOptions[];
  /** Radar errors to calibrate: measured range = scale·r + offset; measured azimuth = az + offset. */
  rangeOffsetM?: number;
  rangeScale?: number;
  azimuthOffsetDeg?: number;
  /** Positioner → radar frame: counter-clockwise rotation (degrees) then translation (m). */
  frameRotationDeg?: number;
  frameTranslation?: Point;
  /** Amplitude of a 1 m² reflector at 1 m, detector units (default 4000), and of the noise (default 1). */
  referenceAmplitude?: number;
  noiseAmplitude?: number;
  /** Rayleigh (Swerling I-like, scan to scan) fluctuation of the echo amplitude (default false). */
  fluctuating?: boolean;
  /** Sample rate of the truth and commanded outputs, Hz (default 10). */
  truthRateHz?: number;
  /** The positioner follows its command this late, s: truth(t) = command(t − lag) (default 0). */
  positionerLagS?: number;
  /** Pulse-to-pulse phase on each detection (Detection.phaseRad); absent = none. */
  phase?: PhaseOptions;
}

export interface PhaseOptions {
  /** Pulse repetition frequency, Hz: the phase step is taken over 1/PRF. */
  prfHz: number;
  /** Wavelength, m (default 0.0318928, 9.4 GHz). */
  wavelengthM?: number;
  /** Phase noise std, degrees (default 5). */
  sigmaDeg?: number;
}

export interface ResolvedTarget {
  id: number;
  trajectory: TrajectorySpec;
  pd: number;
  rcsM2: number;
}

export interface ResolvedFixedEcho {
  x: number;
  y: number;
  pd: number;
  rcsM2: number;
  label: string;
}

export type ResolvedAntenna =
  | { mode: 'rotating'; periodS: number; startAzimuthRad: number }
  | { mode: 'staring'; rateHz: number; centerAzimuthRad: number; sectorRad: number };

export interface ResolvedScenario {
  name: string;
  description: string;
  durationS: number;
  seed: number;
  antenna: ResolvedAntenna;
  minRangeM: number;
  maxRangeM: number;
  sigmaRangeM: number;
  sigmaAzimuthRad: number;
  falseAlarmRateHz: number;
  targets: ResolvedTarget[];
  fixedEchoes: ResolvedFixedEcho[];
  rangeOffsetM: number;
  rangeScale: number;
  azimuthOffsetRad: number;
  frameRotationRad: number;
  frameTranslation: Point;
  referenceAmplitude: number;
  noiseAmplitude: number;
  fluctuating: boolean;
  truthRateHz: number;
  positionerLagS: number;
  phase: { prfHz: number; wavelengthM: number; sigmaRad: number } | null;
}

const DEG = Math.PI / 180;

function positive(name: string, v: number): number {
  if (!(v > 0) || !Number.isFinite(v)) throw new EchotrailError('E_OPTION', `scenario: ${name} must be a positive number (got ${v})`);
  return v;
}

function probability(name: string, v: number): number {
  if (!(v >= 0 && v <= 1)) throw new EchotrailError('E_OPTION', `scenario: ${name} must be between 0 and 1 (got ${v})`);
  return v;
}

/** Fills defaults, converts degrees to radians, expands walls and checks ranges of values. */
export function resolveScenarioOptions(o: ScenarioOptions = {}): ResolvedScenario {
  const a = o.antenna ?? { mode: 'rotating' };
  const antenna: ResolvedAntenna =
    a.mode === 'rotating'
      ? { mode: 'rotating', periodS: positive('antenna.periodS', a.periodS ?? 1), startAzimuthRad: (a.startAzimuthDeg ?? 0) * DEG }
      : { mode: 'staring', rateHz: positive('antenna.rateHz', a.rateHz ?? 200), centerAzimuthRad: (a.centerAzimuthDeg ?? 0) * DEG, sectorRad: positive('antenna.sectorDeg', a.sectorDeg ?? 60) * DEG };
  const pd = probability('pd', o.pd ?? 0.95);
  const targets = (o.targets ?? []).map((t, i) => ({ id: t.id ?? i + 1, trajectory: t.trajectory, pd: probability(`targets[${i}].pd`, t.pd ?? pd), rcsM2: positive(`targets[${i}].rcsM2`, t.rcsM2 ?? 0.025) }));
  const fixedEchoes: ResolvedFixedEcho[] = (o.fixedEchoes ?? []).map((f, i) => ({ x: f.x, y: f.y, pd: probability(`fixedEchoes[${i}].pd`, f.pd ?? 0.98), rcsM2: positive(`fixedEchoes[${i}].rcsM2`, f.rcsM2 ?? 0.05), label: f.label ?? `echo ${i + 1}` }));
  for (const [i, w] of (o.walls ?? []).entries()) {
    const len = Math.hypot(w.to.x - w.from.x, w.to.y - w.from.y);
    const n = Math.max(1, Math.round(len / positive(`walls[${i}].spacingM`, w.spacingM ?? 0.3)));
    for (let k = 0; k <= n; k++) {
      const f = k / n;
      fixedEchoes.push({ x: w.from.x + f * (w.to.x - w.from.x), y: w.from.y + f * (w.to.y - w.from.y), pd: probability(`walls[${i}].pd`, w.pd ?? 0.9), rcsM2: w.rcsM2 ?? 0.2, label: `wall ${i + 1}` });
    }
  }
  const minRangeM = o.minRangeM ?? 0.3;
  const maxRangeM = positive('maxRangeM', o.maxRangeM ?? 8);
  if (!(minRangeM >= 0 && minRangeM < maxRangeM)) throw new EchotrailError('E_OPTION', `scenario: minRangeM must be ≥ 0 and below maxRangeM (got ${minRangeM}, ${maxRangeM})`);
  return {
    name: o.name ?? 'custom',
    description: o.description ?? '',
    durationS: positive('durationS', o.durationS ?? 60),
    seed: Math.trunc(o.seed ?? 1),
    antenna,
    minRangeM,
    maxRangeM,
    sigmaRangeM: Math.max(0, o.sigmaRangeM ?? 0.05),
    sigmaAzimuthRad: Math.max(0, o.sigmaAzimuthDeg ?? 1.5) * DEG,
    falseAlarmRateHz: Math.max(0, o.falseAlarmRateHz ?? 0.5),
    targets,
    fixedEchoes,
    rangeOffsetM: o.rangeOffsetM ?? 0,
    rangeScale: positive('rangeScale', o.rangeScale ?? 1),
    azimuthOffsetRad: (o.azimuthOffsetDeg ?? 0) * DEG,
    frameRotationRad: (o.frameRotationDeg ?? 0) * DEG,
    frameTranslation: o.frameTranslation ?? { x: 0, y: 0 },
    referenceAmplitude: positive('referenceAmplitude', o.referenceAmplitude ?? 4000),
    noiseAmplitude: Math.max(0, o.noiseAmplitude ?? 1),
    fluctuating: o.fluctuating ?? false,
    truthRateHz: positive('truthRateHz', o.truthRateHz ?? 10),
    positionerLagS: Math.max(0, o.positionerLagS ?? 0),
    // λ = c/f at 9.4 GHz (c exact, SI): 0.0318928 m (recomputed from the SI value of c).
    phase: o.phase ? { prfHz: positive('phase.prfHz', o.phase.prfHz), wavelengthM: positive('phase.wavelengthM', o.phase.wavelengthM ?? 299_792_458 / 9.4e9), sigmaRad: Math.max(0, o.phase.sigmaDeg ?? 5) * DEG } : null,
  };
}
