/**
 * One-dimensional move profiles shared by the trajectories: a point-to-point move with a
 * trapezoidal speed profile (accelerate, cruise, decelerate), as a motorised positioner does it,
 * and a piecewise constant-acceleration profile.
 */

/** A 1-D move of `distanceM` that starts and ends at rest. */
export interface Move {
  /** Total duration of the move, s. */
  durationS: number;
  /** Distance travelled after `tS` seconds (clamped to [0, duration]), m. */
  at(tS: number): { s: number; v: number };
}

/**
 * Trapezoidal profile. With `accelMps2` = Infinity (or ≤ 0) the speed jumps to `speedMps` at once,
 * which is how a stepper rail without ramping behaves; otherwise it ramps, and when the distance is
 * too short to reach the cruise speed the profile becomes triangular.
 */
export function trapezoidMove(distanceM: number, speedMps: number, accelMps2: number): Move {
  const d = Math.max(0, distanceM);
  const vmax = Math.max(1e-9, speedMps);
  if (!(accelMps2 > 0) || !Number.isFinite(accelMps2)) {
    const duration = d / vmax;
    return {
      durationS: duration,
      at: (t) => (t <= 0 ? { s: 0, v: 0 } : t >= duration ? { s: d, v: 0 } : { s: vmax * t, v: vmax }),
    };
  }
  const a = accelMps2;
  const vpeak = Math.min(vmax, Math.sqrt(d * a));
  const ta = vpeak / a; // ramp time
  const dRamp = 0.5 * a * ta * ta;
  const tc = vpeak > 0 ? (d - 2 * dRamp) / vpeak : 0; // cruise time
  const duration = 2 * ta + tc;
  return {
    durationS: duration,
    at(t) {
      if (t <= 0) return { s: 0, v: 0 };
      if (t >= duration) return { s: d, v: 0 };
      if (t < ta) return { s: 0.5 * a * t * t, v: a * t };
      if (t < ta + tc) return { s: dRamp + vpeak * (t - ta), v: vpeak };
      const r = duration - t; // time left
      return { s: d - 0.5 * a * r * r, v: a * r };
    },
  };
}

/** One segment of constant acceleration. */
export interface AccelSegment {
  /** Length of the segment, s. */
  durationS: number;
  /** Acceleration along the line during the segment, m/s² (negative slows or reverses). */
  accelMps2: number;
}

/**
 * Position and speed along a line after `tS` seconds, starting at s = 0 with speed `v0`, through
 * the given segments; after the last segment the speed stays constant.
 */
export function segmentedMotion(v0: number, segments: AccelSegment[]): (tS: number) => { s: number; v: number } {
  // Precompute the state at the start of each segment so evaluation is O(segments) without re-integration.
  const starts: { t: number; s: number; v: number }[] = [];
  let t = 0;
  let s = 0;
  let v = v0;
  for (const seg of segments) {
    starts.push({ t, s, v });
    s += v * seg.durationS + 0.5 * seg.accelMps2 * seg.durationS * seg.durationS;
    v += seg.accelMps2 * seg.durationS;
    t += seg.durationS;
  }
  const end = { t, s, v };
  return (tS) => {
    if (tS <= 0) return { s: v0 * tS, v: v0 };
    for (let i = starts.length - 1; i >= 0; i--) {
      const st = starts[i];
      if (tS >= st.t && tS < st.t + segments[i].durationS) {
        const dt = tS - st.t;
        const a = segments[i].accelMps2;
        return { s: st.s + st.v * dt + 0.5 * a * dt * dt, v: st.v + a * dt };
      }
    }
    const dt = tS - end.t;
    return { s: end.s + end.v * dt, v: end.v };
  };
}
