/**
 * The simulator proper: `iterateRun` walks the run window by window (one revolution, or one second
 * for a staring antenna) and yields detections, truth and commanded samples in time order, so a
 * run of millions of rows needs memory for one window only. `simulateRun` collects everything.
 */
import type { Detection } from '../types.ts';
import { beamCrossings, inSector, staringLooks } from './antenna.ts';
import { measurePolar, meanAmplitude, positionerToRadar, pulsePhase, sampleAmplitude, toPolar, wrapTwoPi } from './measure.ts';
import { createRng } from './prng.ts';
import { resolveScenarioOptions, type ResolvedScenario, type ScenarioOptions } from './scenario.ts';
import { makeTrajectory, type KinematicState, type Trajectory } from './trajectories.ts';
import { falseAlarmAmplitude } from './clutter.ts';

/** True state of a target, radar frame. */
export interface TruthSample {
  timeS: number;
  targetId: number;
  x: number;
  y: number;
  vx: number;
  vy: number;
}

/** Where the positioner was told to be, positioner frame. */
export interface CommandedPoint {
  timeS: number;
  x: number;
  y: number;
}

/** What produced a detection (known only to the simulator; for tests and scoring). */
export type DetectionOrigin =
  | { kind: 'target'; targetId: number; trueRangeM: number; trueAzimuthRad: number }
  | { kind: 'fixed-echo'; index: number; trueRangeM: number; trueAzimuthRad: number }
  | { kind: 'false-alarm' };

export type SimRecord =
  | { kind: 'detection'; detection: Detection; origin: DetectionOrigin }
  | { kind: 'truth'; sample: TruthSample }
  | { kind: 'commanded'; targetId: number; point: CommandedPoint };

/** The radar-frame state of target `index` at time t (exact, no noise). */
export function targetStateAt(sc: ResolvedScenario, index: number, tS: number): KinematicState {
  return positionerToRadar(makeTrajectory(sc.targets[index].trajectory)(tS - sc.positionerLagS), sc.frameRotationRad, sc.frameTranslation);
}

/** Yields the records of a run in time order (ties: detections before samples). */
export function* iterateRun(options: ScenarioOptions | ResolvedScenario): Generator<SimRecord> {
  const sc = 'sigmaAzimuthRad' in options ? options : resolveScenarioOptions(options);
  const rng = createRng(sc.seed);
  const trajectories: Trajectory[] = sc.targets.map((t) => makeTrajectory(t.trajectory));
  const lag = sc.positionerLagS;
  const radarState = (i: number, t: number) => positionerToRadar(trajectories[i](t - lag), sc.frameRotationRad, sc.frameTranslation);
  const ant = sc.antenna;
  const windowS = ant.mode === 'rotating' ? ant.periodS : 1;
  const inRange = (r: number) => r >= sc.minRangeM && r <= sc.maxRangeM;
  let truthIndex = 0;
  for (let t0 = 0; t0 < sc.durationS; t0 += windowS) {
    const t1 = Math.min(t0 + windowS, sc.durationS);
    const out: { t: number; rank: number; rec: SimRecord }[] = [];
    const emit = (t: number, x: number, y: number, radialMps: number, pd: number, rcsM2: number, origin: (r: number, az: number) => DetectionOrigin) => {
      const truePolar = toPolar(x, y);
      if (!inRange(truePolar.rangeM) || !inSector(ant, truePolar.azimuthRad) || !rng.chance(pd)) return;
      const m = measurePolar(sc, rng, { x, y });
      const amplitude = sampleAmplitude(sc, rng, meanAmplitude(sc, rcsM2, truePolar.rangeM));
      const detection: Detection = { timeS: t, azimuthRad: m.azimuthRad, rangeM: m.rangeM, amplitude };
      const phaseRad = pulsePhase(sc, rng, radialMps);
      if (phaseRad !== undefined) detection.phaseRad = phaseRad;
      out.push({ t, rank: 0, rec: { kind: 'detection', detection, origin: origin(truePolar.rangeM, truePolar.azimuthRad) } });
    };
    const looks = (azimuthAt: (t: number) => number): number[] =>
      ant.mode === 'rotating' ? beamCrossings(ant.periodS, ant.startAzimuthRad, t0, t1, azimuthAt) : staringLooks(ant.rateHz, t0, t1);
    sc.targets.forEach((target, i) => {
      for (const t of looks((tt) => {
        const s = radarState(i, tt);
        return toPolar(s.x, s.y).azimuthRad;
      })) {
        const s = radarState(i, t);
        const radial = (s.x * s.vx + s.y * s.vy) / Math.max(Math.hypot(s.x, s.y), 1e-9);
        emit(t, s.x, s.y, radial, target.pd, target.rcsM2, (r, az) => ({ kind: 'target', targetId: target.id, trueRangeM: r, trueAzimuthRad: az }));
      }
    });
    sc.fixedEchoes.forEach((echo, index) => {
      const az = toPolar(echo.x, echo.y).azimuthRad;
      for (const t of looks(() => az)) emit(t, echo.x, echo.y, 0, echo.pd, echo.rcsM2, (r, a) => ({ kind: 'fixed-echo', index, trueRangeM: r, trueAzimuthRad: a }));
    });
    // False alarms: a Poisson number per window, uniform over range and over the covered azimuths
    // (uniform per resolution cell, which is how a CFAR detector's false alarms fall).
    const nFalse = rng.poisson(sc.falseAlarmRateHz * (t1 - t0));
    for (let k = 0; k < nFalse; k++) {
      const rangeM = rng.between(sc.minRangeM, sc.maxRangeM);
      let azimuthRad: number;
      let t: number;
      if (ant.mode === 'rotating') {
        azimuthRad = rng.between(0, 2 * Math.PI);
        const beam0 = ant.startAzimuthRad + (2 * Math.PI * t0) / ant.periodS;
        t = t0 + (wrapTwoPi(azimuthRad - beam0) / (2 * Math.PI)) * ant.periodS;
        if (t > t1) continue; // the last, shortened window does not reach this azimuth
      } else {
        azimuthRad = wrapTwoPi(ant.centerAzimuthRad + rng.between(-0.5, 0.5) * ant.sectorRad);
        t = rng.between(t0, t1);
      }
      const detection: Detection = { timeS: t, azimuthRad, rangeM, amplitude: falseAlarmAmplitude(sc, rng) };
      if (sc.phase) detection.phaseRad = rng.between(-Math.PI, Math.PI); // noise has no Doppler
      out.push({ t, rank: 0, rec: { kind: 'detection', detection, origin: { kind: 'false-alarm' } } });
    }
    for (; truthIndex / sc.truthRateHz <= t1 + 1e-12; truthIndex++) {
      const t = truthIndex / sc.truthRateHz;
      sc.targets.forEach((target, i) => {
        const p = trajectories[i](t);
        const s = positionerToRadar(lag > 0 ? trajectories[i](t - lag) : p, sc.frameRotationRad, sc.frameTranslation);
        out.push({ t, rank: 1, rec: { kind: 'truth', sample: { timeS: t, targetId: target.id, x: s.x, y: s.y, vx: s.vx, vy: s.vy } } });
        out.push({ t, rank: 2, rec: { kind: 'commanded', targetId: target.id, point: { timeS: t, x: p.x, y: p.y } } });
      });
    }
    out.sort((a, b) => a.t - b.t || a.rank - b.rank);
    for (const e of out) yield e.rec;
  }
}

export interface SimulatedRun {
  scenario: ResolvedScenario;
  /** All detections, time order. */
  detections: Detection[];
  /** What produced each detection, same order as `detections`. */
  origins: DetectionOrigin[];
  /** Radar-frame truth of every target at the truth rate, time order. */
  truth: TruthSample[];
  /** Commanded path per target, positioner frame, in target order. */
  commanded: { targetId: number; points: CommandedPoint[] }[];
}

/** Runs a whole scenario into memory. For long runs use `iterateRun`. */
export function simulateRun(options: ScenarioOptions | ResolvedScenario): SimulatedRun {
  const scenario = 'sigmaAzimuthRad' in options ? options : resolveScenarioOptions(options);
  const run: SimulatedRun = { scenario, detections: [], origins: [], truth: [], commanded: scenario.targets.map((t) => ({ targetId: t.id, points: [] })) };
  const byId = new Map(run.commanded.map((c) => [c.targetId, c.points]));
  for (const rec of iterateRun(scenario)) {
    if (rec.kind === 'detection') {
      run.detections.push(rec.detection);
      run.origins.push(rec.origin);
    } else if (rec.kind === 'truth') run.truth.push(rec.sample);
    else byId.get(rec.targetId)?.push(rec.point);
  }
  return run;
}
