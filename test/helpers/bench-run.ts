/**
 * A small deterministic bench run for bridge tests and the latency benchmark: one reflector on a
 * circle, a rotating antenna, a detection each time the beam crosses it (with a little seeded
 * noise), antenna records at every 1/8 revolution and positioner records at 10 Hz.
 * Deliberately independent of bridge/sim/ so that the server tests only test the server.
 */
import type { WireRecord } from '../../bridge/ingest/line-protocol.ts';
import { encodeLine } from '../../bridge/ingest/line-protocol.ts';
import type { TrackerOptionsInput } from '../../bridge/tracking/tracker-options.ts';

/** Shape of the run. */
export interface BenchRunOptions {
  /** Antenna revolution period, s. */
  periodS: number;
  /** Circle centre, m (radar frame). */
  centre: { x: number; y: number };
  /** Circle radius, m. */
  radiusM: number;
  /** Reflector speed along the circle, m/s. */
  speedMps: number;
  /** Run length, s. */
  durationS: number;
  /** Extra stationary reflectors seen every revolution (to raise the detection rate). */
  clutter: number;
  /** Seed of the noise. */
  seed: number;
}

export function resolveBenchRunOptions(o: Partial<BenchRunOptions> = {}): BenchRunOptions {
  return {
    periodS: o.periodS ?? 0.1,
    centre: o.centre ?? { x: 0, y: 3 },
    radiusM: o.radiusM ?? 1,
    speedMps: o.speedMps ?? 0.5,
    durationS: o.durationS ?? 10,
    clutter: o.clutter ?? 0,
    seed: o.seed ?? 1,
  };
}

/** Tracker settings matching the run, so no warm-up inference is needed. */
export function trackerOptionsFor(o: BenchRunOptions): TrackerOptionsInput {
  return { antenna: 'rotating', intervalS: o.periodS, measurement: { sigmaRangeM: 0.02, sigmaAzimuthRad: 0.5 * (Math.PI / 180) } };
}

function lcg(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

const TWO_PI = 2 * Math.PI;

/** The records of the run in time order. */
export function* benchRecords(input: Partial<BenchRunOptions> = {}): Generator<WireRecord> {
  const o = resolveBenchRunOptions(input);
  const rnd = lcg(o.seed);
  const noise = (sd: number): number => (rnd() + rnd() + rnd() - 1.5) * 2 * sd; // roughly normal
  const pos = (t: number): { x: number; y: number } => {
    const a = (o.speedMps * t) / o.radiusM;
    return { x: o.centre.x + o.radiusM * Math.sin(a), y: o.centre.y + o.radiusM * Math.cos(a) };
  };
  const clutterAz = Array.from({ length: o.clutter }, (_, i) => ((i + 0.5) / o.clutter) * TWO_PI);
  let nextPos = 0;
  const revs = Math.floor(o.durationS / o.periodS);
  for (let k = 0; k < revs; k++) {
    const t0 = k * o.periodS;
    const events: { t: number; rec: WireRecord }[] = [];
    for (let i = 0; i < 8; i++) events.push({ t: t0 + (i / 8) * o.periodS, rec: { kind: 'antenna', sample: { timeS: t0 + (i / 8) * o.periodS, azimuthRad: (i / 8) * TWO_PI } } });
    const p = pos(t0);
    const az = (Math.atan2(p.x, p.y) + TWO_PI) % TWO_PI;
    const t = t0 + (az / TWO_PI) * o.periodS;
    const q = pos(t);
    const r = Math.hypot(q.x, q.y);
    events.push({ t, rec: { kind: 'detection', detection: { timeS: t, azimuthRad: (Math.atan2(q.x, q.y) + noise(0.004) + TWO_PI) % TWO_PI, rangeM: r + noise(0.01), amplitude: 50 + 10 * rnd() } } });
    for (const caz of clutterAz) {
      const tc = t0 + (caz / TWO_PI) * o.periodS;
      events.push({ t: tc, rec: { kind: 'detection', detection: { timeS: tc, azimuthRad: caz, rangeM: 5 + noise(0.01), amplitude: 20 + 5 * rnd() } } });
    }
    while (nextPos < t0 + o.periodS) {
      const c = pos(nextPos);
      events.push({ t: nextPos, rec: { kind: 'positioner', sample: { timeS: nextPos, cmdX: c.x, cmdY: c.y } } });
      nextPos += 0.1;
    }
    events.sort((a, b) => a.t - b.t);
    for (const e of events) yield e.rec;
  }
}

/** Run time of a wire record. */
export function recordTime(r: WireRecord): number {
  return r.kind === 'detection' ? r.detection.timeS : r.sample.timeS;
}

/** The run as protocol lines (newline-terminated). */
export function* benchLines(input: Partial<BenchRunOptions> = {}): Generator<{ timeS: number; line: string; record: WireRecord }> {
  for (const record of benchRecords(input)) yield { timeS: recordTime(record), line: encodeLine(record) + '\n', record };
}

/** The run as a detections CSV (the `track` input format). */
export function benchCsv(input: Partial<BenchRunOptions> = {}): string {
  const rows = ['time_s,azimuth_deg,range_m,amplitude'];
  for (const r of benchRecords(input)) {
    if (r.kind !== 'detection') continue;
    const d = r.detection;
    rows.push(`${d.timeS.toFixed(6)},${((d.azimuthRad * 180) / Math.PI).toFixed(4)},${d.rangeM.toFixed(4)},${d.amplitude.toFixed(3)}`);
  }
  return rows.join('\n') + '\n';
}
