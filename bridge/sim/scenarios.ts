/**
 * Built-in scenarios: an invented bench, "bay 3". The radar stands at the origin looking along +y.
 * A 3 m linear rail runs across the room at y = 3 m on two mounts; an X–Y stage sits at 2.8 m; a
 * turntable arm at 3.5 m; the back wall is at y = 7.2 m; the feed cable has a joint that echoes at
 * about 0.6 m. All numbers are made up for these runs.
 */
import { EchotrailError } from '../errors.ts';
import type { FixedEchoOptions, ScenarioOptions, TargetOptions, WallOptions } from './scenario.ts';
import { createRng } from './prng.ts';

const BAY3_ECHOES: FixedEchoOptions[] = [
  { x: 0.1, y: 0.6, rcsM2: 0.02, label: 'feed cable joint' },
  { x: -1.8, y: 3.05, rcsM2: 0.08, label: 'rail mount west' },
  { x: 1.8, y: 3.05, rcsM2: 0.08, label: 'rail mount east' },
];
const BAY3_WALL: WallOptions[] = [{ from: { x: -3, y: 7.2 }, to: { x: 3, y: 7.2 }, spacingM: 0.6 }];
const bay3 = { fixedEchoes: BAY3_ECHOES, walls: BAY3_WALL };

export const SCENARIOS: Record<string, ScenarioOptions> = {
  'rail-sweep': {
    ...bay3,
    description: 'one reflector on the 3 m rail, back and forth at 0.25 m/s with ramps, 5 s dwell at the ends and a 3 s stop mid-rail; 1 s antenna',
    durationS: 120,
    targets: [{ trajectory: { kind: 'rail', from: { x: -1.5, y: 3 }, to: { x: 1.5, y: 3 }, speedMps: 0.25, accelMps2: 0.5, dwellS: 5, stops: [{ at: 0.5, dwellS: 3 }] } }],
  },
  'long-pause': {
    ...bay3,
    description: 'rail reflector that rests 40 s at each end between 0.3 m/s passes (a paused target must keep its track)',
    durationS: 150,
    targets: [{ trajectory: { kind: 'rail', from: { x: -1.2, y: 3 }, to: { x: 1.2, y: 3 }, speedMps: 0.3, accelMps2: 0.6, dwellS: 40 } }],
  },
  turntable: {
    ...bay3,
    description: 'reflector on a 0.6 m turntable arm centred at 3.5 m, one turn in 12 s; 0.5 s antenna',
    durationS: 60,
    antenna: { mode: 'rotating', periodS: 0.5 },
    targets: [{ trajectory: { kind: 'circle', center: { x: 0, y: 3.5 }, radiusM: 0.6, periodS: 12 } }],
  },
  'xy-eight': {
    ...bay3,
    description: 'X–Y stage drawing a 1.6 m × 0.8 m figure-eight in 20 s at 2.8 m; 1 s antenna',
    durationS: 80,
    targets: [{ trajectory: { kind: 'figure-eight', center: { x: 0.4, y: 2.8 }, widthM: 1.6, heightM: 0.8, periodS: 20 } }],
  },
  'crossing-pair': {
    ...bay3,
    description: 'two reflectors on crossing diagonal carriages, 0.2 m/s, meeting mid-room at t ≈ 11 s',
    durationS: 30,
    targets: [
      { trajectory: { kind: 'line', from: { x: -1.5, y: 2.4 }, to: { x: 1.5, y: 3.6 }, speedMps: 0.2, startS: 3 } },
      { trajectory: { kind: 'line', from: { x: 1.5, y: 2.4 }, to: { x: -1.5, y: 3.6 }, speedMps: 0.2, startS: 3 } },
    ],
  },
  'brake-reverse': {
    ...bay3,
    description: 'carriage accelerates to 1 m/s, brakes to a stop, waits 4 s, reverses to −1 m/s and stops; 0.5 s antenna',
    durationS: 25,
    antenna: { mode: 'rotating', periodS: 0.5 },
    targets: [{ trajectory: { kind: 'profile', start: { x: 0, y: 1.5 }, headingDeg: 20, segments: [
      { durationS: 1, accelMps2: 0 }, { durationS: 2.5, accelMps2: 0.4 }, { durationS: 1, accelMps2: 0 }, { durationS: 1.25, accelMps2: -0.8 },
      { durationS: 4, accelMps2: 0 }, { durationS: 2, accelMps2: -0.5 }, { durationS: 1, accelMps2: 0 }, { durationS: 1, accelMps2: 1 },
    ] } }],
  },
  'waypoint-tour': {
    ...bay3,
    description: 'X–Y stage visiting five waypoints at mixed speeds with dwells, looping',
    durationS: 90,
    targets: [{ trajectory: { kind: 'waypoints', speedMps: 0.3, accelMps2: 0.4, loop: true, points: [
      { x: -0.8, y: 2.2, dwellS: 2 }, { x: 0.9, y: 2.4, speedMps: 0.5 }, { x: 1.1, y: 4.0, dwellS: 4, speedMps: 0.15 }, { x: -0.4, y: 4.6 }, { x: -1.2, y: 3.3, dwellS: 1 },
    ] } }],
  },
  'staring-approach': {
    description: 'staring antenna at 250 Hz over a 40° sector; a reflector closes from 6 m to 1 m at 0.4 m/s',
    durationS: 20,
    antenna: { mode: 'staring', rateHz: 250, sectorDeg: 40 },
    falseAlarmRateHz: 20,
    fixedEchoes: [BAY3_ECHOES[0]],
    targets: [{ trajectory: { kind: 'line', from: { x: 0.3, y: 6 }, to: { x: -0.2, y: 1.0 }, speedMps: 0.4, startS: 1 } }],
  },
  'offsets-check': {
    ...bay3,
    description: 'figure-eight run on a mis-calibrated bench: range +0.12 m, azimuth +2°, positioner frame turned 3° and shifted (5, −8) cm',
    durationS: 120,
    rangeOffsetM: 0.12,
    azimuthOffsetDeg: 2,
    frameRotationDeg: 3,
    frameTranslation: { x: 0.05, y: -0.08 },
    targets: [{ trajectory: { kind: 'figure-eight', center: { x: 0, y: 3 }, widthM: 2, heightM: 1.2, periodS: 30 } }],
  },
  'tape-points': {
    description: 'three corner reflectors on stands at tape-measured spots; range +0.12 m, scale 1.004, azimuth +2°',
    durationS: 60,
    falseAlarmRateHz: 0.2,
    rangeOffsetM: 0.12,
    rangeScale: 1.004,
    azimuthOffsetDeg: 2,
    fixedEchoes: [BAY3_ECHOES[0]],
    targets: [
      { trajectory: { kind: 'static', at: { x: 0.5, y: 1.5 } } },
      { trajectory: { kind: 'static', at: { x: -1.0, y: 3.0 } } },
      { trajectory: { kind: 'static', at: { x: 1.2, y: 4.8 } } },
    ],
  },
};

/**
 * Many targets for throughput work: `count` reflectors on circles and rails spread over 0.5–24 m,
 * with dense clutter (40 false alarms per second per 100 targets). Placement is seeded.
 */
export function crowdScenario(count: number, seed = 7): ScenarioOptions {
  const rng = createRng(seed ^ 0x5eed);
  const targets: TargetOptions[] = [];
  for (let i = 0; i < count; i++) {
    const r = rng.between(1.5, 22);
    const az = rng.between(0, 2 * Math.PI);
    const center = { x: r * Math.sin(az), y: r * Math.cos(az) };
    const speed = rng.between(0.1, 1.2);
    targets.push(
      i % 2 === 0
        ? { trajectory: { kind: 'circle', center, radiusM: rng.between(0.3, 1.2), periodS: rng.between(8, 40), startAngleDeg: rng.between(0, 360), clockwise: i % 4 === 0 } }
        : { trajectory: { kind: 'rail', from: { x: center.x - 1, y: center.y }, to: { x: center.x + 1, y: center.y }, speedMps: speed, dwellS: rng.between(0, 5) } },
    );
  }
  return { description: `${count} targets over 0.5–24 m with dense clutter`, durationS: 60, maxRangeM: 24, minRangeM: 0.5, falseAlarmRateHz: 0.4 * count, targets };
}

/** A built-in scenario by name; `crowd` takes `count`. Throws E_OPTION for unknown names. */
export function builtinScenario(name: string, count = 100): ScenarioOptions {
  if (name === 'crowd') return { name, ...crowdScenario(count) };
  const s = SCENARIOS[name];
  if (!s) throw new EchotrailError('E_OPTION', `unknown scenario '${name}': use one of ${[...Object.keys(SCENARIOS), 'crowd'].join(', ')} or a .json file`);
  return { name, ...s };
}
