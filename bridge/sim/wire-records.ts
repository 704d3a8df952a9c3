/**
 * A simulated run as the acquisition hardware would send it: detections interleaved with antenna
 * heartbeats and positioner samples (commanded and encoder position of each target, named by its
 * id when there are several), in time order, as line-protocol records. Used by `echotrail feed` (to a serial port) and
 * `echotrail demo` (through the tracker into a session file), so both tell the same story.
 */
import type { WireRecord } from '../ingest/line-protocol.ts';
import { beamAzimuth } from './antenna.ts';
import { iterateRun, type SimRecord } from './run.ts';
import type { ResolvedScenario } from './scenario.ts';
import type { PositionerSample } from '../types.ts';

function simTime(r: SimRecord): number {
  return r.kind === 'detection' ? r.detection.timeS : r.kind === 'truth' ? r.sample.timeS : r.point.timeS;
}

/** Time of a wire record, s. */
export function wireTime(r: WireRecord): number {
  return r.kind === 'detection' ? r.detection.timeS : r.sample.timeS;
}

/**
 * One pass over the scenario shifted by `offsetS` seconds (so that a looping feed keeps its
 * device clock running forward). `antennaRateHz` heartbeats per second on a rotating antenna;
 * 0 sends none.
 */
export function* wireRecords(sc: ResolvedScenario, offsetS = 0, antennaRateHz = 10): Generator<WireRecord> {
  let nextAntenna = 0;
  const cmd = new Map<number, { x: number; y: number }>();
  // Several positioners (carriages) name themselves, as the commanded paths of a session do.
  const named = sc.targets.length > 1;
  // The run yields a target's truth sample just before the commanded point of the same instant:
  // the encoder sample waits for it, so that a positioner record pairs the command and the
  // position of one instant (pairing it with the previous command made every positioner record
  // a sample period late, which `compare` then read as positioner lag).
  const pending = new Map<number, { timeS: number; x: number; y: number }>();
  const positioner = (id: number, p: { timeS: number; x: number; y: number }, c: { x: number; y: number }): WireRecord => {
    const sample: PositionerSample = { timeS: p.timeS + offsetS, cmdX: c.x, cmdY: c.y, measX: p.x, measY: p.y };
    if (named) sample.target = String(id);
    return { kind: 'positioner', sample };
  };
  function* flush(beforeS: number): Generator<WireRecord> {
    for (const [id, p] of pending) {
      if (p.timeS >= beforeS) continue;
      pending.delete(id);
      yield positioner(id, p, cmd.get(id) ?? p);
    }
  }
  for (const r of iterateRun(sc)) {
    const t = simTime(r);
    if (pending.size) yield* flush(t);
    if (sc.antenna.mode === 'rotating' && antennaRateHz > 0) {
      for (; nextAntenna <= t; nextAntenna += 1 / antennaRateHz)
        yield { kind: 'antenna', sample: { timeS: nextAntenna + offsetS, azimuthRad: beamAzimuth(sc.antenna.periodS, sc.antenna.startAzimuthRad, nextAntenna) } };
    }
    if (r.kind === 'detection') yield { kind: 'detection', detection: { ...r.detection, timeS: t + offsetS } };
    else if (r.kind === 'commanded') {
      cmd.set(r.targetId, r.point);
      const p = pending.get(r.targetId);
      if (p && r.point.timeS === p.timeS) {
        pending.delete(r.targetId);
        yield positioner(r.targetId, p, r.point);
      }
    } else pending.set(r.sample.targetId, { timeS: t, x: r.sample.x, y: r.sample.y });
  }
  yield* flush(Infinity);
}
