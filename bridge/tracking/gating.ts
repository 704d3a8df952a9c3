/**
 * Gating of one batch: every detection against the tracks the gate index finds near it and against the
 * fixed-echo map, producing the candidate pairs for the two assignment passes.
 */
import type { Detection, Measurement } from '../types.ts';
import type { GatedPair } from './assignment.ts';
import type { EchoLookup, FixedEchoMap } from './fixed-echo-map.ts';
import type { GateIndex } from './gate-index.ts';
import type { Track } from './track-life.ts';

export interface BatchGates {
  /** Pairs with established tracks (confirmed, coasting): assigned first. */
  established: GatedPair[];
  /** Pairs with tentative tracks: assigned from what is left. */
  tentative: GatedPair[];
  /** Price of leaving each gated track without a detection. */
  missCost: Map<number, number>;
  /** Cost of each detection as a fixed echo (Infinity: no active echo gates it). */
  echoCost: Float64Array;
  /** Fixed-echo look-up of each detection (when the map is on). */
  echo: EchoLookup[];
  /** 1 where an established track expects the detection (it then never seeds a new track). */
  nearEstablished: Uint8Array;
}

/**
 * An established track takes a detection that only its manoeuvre model gates (an "unlikely"
 * pair) only if its amplitude is at least this share of the track's recent amplitude (−14 dB).
 * A false alarm sits near the detection threshold while the track's reflector is usually well
 * above it; the manoeuvre model's wide gate is where a false alarm can pull a track off its target
 * and send it coasting away at the speed the jump implies. Amplitude as a feature of the
 * association: Lerro & Bar-Shalom, "Interacting multiple model tracking with target amplitude
 * feature", IEEE Trans. AES 29(2), 1993. The ratio is ours: a Rayleigh-fluctuating echo (Swerling
 * I) falls below a fifth of its mean amplitude in 3.1 % of scans (P = 1 − exp(−(0.2·√(π/2))²/2),
 * from the Rayleigh distribution function, common practice), so the veto costs a fluctuating
 * target about one detection in thirty, and only where its likely model missed it anyway.
 */
export const MANOEUVRE_AMPLITUDE_FLOOR = 0.2;

/**
 * @param minGapS a track takes no detection less than this after its last hit: on a rotating
 *   antenna one target answers once per revolution, so a second detection within the same sweep
 *   is a neighbour's (the way a track would chain along a wall of reflectors); 0 = no limit
 * @param maxSpeedMps fastest expected target: no track takes a detection farther from its last hit
 *   than this speed covers plus 3σ of both detections' noise (the reach of a seed, seeds.ts). It
 *   matters where the χ² gate is wide: a tentative track has not learned its velocity yet, and the
 *   position variance of a coasting IMM's manoeuvre model grows as the fourth power of the time
 *   since its last hit, its gate to tens of metres after a few missed scans, which no positioner
 *   covers.
 * @param detections the detections `ms` were converted from (same order), whose amplitudes the
 *   manoeuvre gate's amplitude floor reads
 *   (MANOEUVRE_AMPLITUDE_FLOOR); null = no floor
 */
export function gateBatch(
  ms: readonly Measurement[],
  index: Pick<GateIndex<Track>, 'query'>,
  echoes: FixedEchoMap | null,
  gamma: number,
  minGapS = 0,
  maxSpeedMps = Infinity,
  detections: readonly Pick<Detection, 'amplitude'>[] | null = null,
): BatchGates {
  const g: BatchGates = {
    established: [],
    tentative: [],
    missCost: new Map(),
    echoCost: new Float64Array(ms.length).fill(Infinity),
    echo: new Array(ms.length),
    nearEstablished: new Uint8Array(ms.length),
  };
  for (let j = 0; j < ms.length; j++) {
    const m = ms[j];
    if (echoes) {
      g.echo[j] = echoes.lookup(m);
      g.echoCost[j] = echoes.costOf(g.echo[j], m);
    }
    const echoCost = g.echoCost[j];
    for (const t of index.query(m.x, m.y)) {
      const id = t.id;
      // Inside a fixed echo's gate only a moving track may take a detection, and only one that
      // it explains better than the echo does.
      if (echoCost < Infinity && !t.moved) continue;
      if (m.timeS - t.lastHitS < minGapS) continue;
      if (!withinReach(t, m, maxSpeedMps)) continue;
      const { d2, logDetS, d2Likely } = t.filter.gate(m);
      if (!(d2 < gamma)) continue;
      const cost = d2 + logDetS;
      if (cost > echoCost) continue;
      const tentative = t.status === 'tentative';
      const unlikely = !((d2Likely ?? d2) < gamma);
      if (unlikely && !tentative && detections && tooFaintToManoeuvre(t, detections[j].amplitude)) continue;
      (tentative ? g.tentative : g.established).push({ track: id, det: j, cost, unlikely });
      g.missCost.set(id, Math.max(g.missCost.get(id) ?? -Infinity, gamma + logDetS));
      // Only a detection the track really expects (under its likely model) is kept from seeding:
      // the manoeuvre model's wide gate would otherwise keep a close neighbour from ever
      // getting a track of its own.
      if (!tentative && !unlikely) g.nearEstablished[j] = 1;
    }
  }
  return g;
}

/** The detection is far fainter than the track's reflector (see MANOEUVRE_AMPLITUDE_FLOOR). */
function tooFaintToManoeuvre(t: Track, amplitude: number): boolean {
  return amplitude < MANOEUVRE_AMPLITUDE_FLOOR * t.recentAmplitude;
}

/** The detection lies within what the fastest target covers since the track's last hit, plus 3σ of noise. */
function withinReach(t: Track, m: Measurement, maxSpeedMps: number): boolean {
  const h = t.recent[t.recent.length - 1];
  const sig = Math.sqrt(Math.max(h.rxx + m.rxx, h.ryy + m.ryy));
  const reach = maxSpeedMps * Math.max(0, m.timeS - h.timeS) + 3 * sig;
  const dx = m.x - h.x;
  const dy = m.y - h.y;
  return dx * dx + dy * dy <= reach * reach;
}
