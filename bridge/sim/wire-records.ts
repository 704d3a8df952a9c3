/**
 * A simulated run as the acquisition hardware would send it: detections interleaved with antenna
 * heartbeats and positioner samples (commanded and encoder position of the first target), in
 * time order, as line-protocol records. Used by `echotrail feed` (to a serial port) and
 * `echotrail demo` (through the tracker into a session file), so both tell the same story.
 */
import type { WireRecord } from '../ingest/line-protocol.ts';
import { beamAzimuth } from './antenna.ts';
import { iterateRun, type SimRecord } from './run.ts';
import type { ResolvedScenario } from './scenario.ts';

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
  const first = sc.targets[0]?.id;
  // The run yields a target's truth sample just before the commanded point of the same instant:
  // the encoder sample waits for it, so that a positioner record pairs the command and the
  // position of one instant (pairing it with the previous command made every positioner record
  // a sample period late, which `compare` then read as positioner lag).
  let pending: { timeS: number; x: number; y: number } | null = null;
  const positioner = (p: { timeS: number; x: number; y: number }, c: { x: number; y: number }): WireRecord => ({
    kind: 'positioner',
    sample: { timeS: p.timeS + offsetS, cmdX: c.x, cmdY: c.y, measX: p.x, measY: p.y },
  });
  for (const r of iterateRun(sc)) {
    const t = simTime(r);
    if (pending && t > pending.timeS) {
      yield positioner(pending, cmd.get(first) ?? pending);
      pending = null;
    }
    if (sc.antenna.mode === 'rotating' && antennaRateHz > 0) {
      for (; nextAntenna <= t; nextAntenna += 1 / antennaRateHz)
        yield { kind: 'antenna', sample: { timeS: nextAntenna + offsetS, azimuthRad: beamAzimuth(sc.antenna.periodS, sc.antenna.startAzimuthRad, nextAntenna) } };
    }
    if (r.kind === 'detection') yield { kind: 'detection', detection: { ...r.detection, timeS: t + offsetS } };
    else if (r.kind === 'commanded') {
      cmd.set(r.targetId, r.point);
      if (pending && r.targetId === first && r.point.timeS === pending.timeS) {
        yield positioner(pending, r.point);
        pending = null;
      }
    } else if (r.sample.targetId === first) pending = { timeS: t, x: r.sample.x, y: r.sample.y };
  }
  if (pending) yield positioner(pending, cmd.get(first) ?? pending);
}
