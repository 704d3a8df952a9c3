/**
 * Gating of one batch: every detection against the tracks the grid finds near it and against the
 * fixed-echo map, producing the candidate pairs for the two assignment passes.
 */
import type { Measurement } from '../types.ts';
import type { GatedPair } from './assignment.ts';
import type { EchoLookup, FixedEchoMap } from './fixed-echo-map.ts';
import type { SpatialGrid } from './spatial-grid.ts';
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
 * @param minGapS a track takes no detection less than this after its last hit: on a rotating
 *   antenna one target answers once per revolution, so a second detection within the same sweep
 *   is a neighbour's (the way a track would chain along a wall of reflectors); 0 = no limit
 */
export function gateBatch(
  ms: readonly Measurement[],
  grid: SpatialGrid,
  live: Map<number, Track>,
  echoes: FixedEchoMap | null,
  gamma: number,
  minGapS = 0,
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
    for (const id of grid.query(m.x, m.y)) {
      const t = live.get(id)!;
      // Inside a fixed echo's gate only a moving track may take a detection, and only one that
      // it explains better than the echo does.
      if (echoCost < Infinity && !t.moved) continue;
      if (m.timeS - t.lastHitS < minGapS) continue;
      const { d2, logDetS, d2Likely } = t.filter.gate(m);
      if (!(d2 < gamma)) continue;
      const cost = d2 + logDetS;
      if (cost > echoCost) continue;
      const tentative = t.status === 'tentative';
      (tentative ? g.tentative : g.established).push({ track: id, det: j, cost });
      g.missCost.set(id, Math.max(g.missCost.get(id) ?? -Infinity, gamma + logDetS));
      // Only a detection the track really expects (under its likely model) is kept from seeding:
      // the manoeuvre model's wide gate would otherwise keep a close neighbour from ever
      // getting a track of its own.
      if (!tentative && (d2Likely ?? d2) < gamma) g.nearEstablished[j] = 1;
    }
  }
  return g;
}
