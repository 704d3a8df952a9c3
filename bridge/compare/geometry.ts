/**
 * Plane geometry for path comparison: point-to-segment distance with a signed side, and the
 * along-track position of a point on a polyline.
 *
 * Frame: radar at the origin, x = r·sin(az), y = r·cos(az) (azimuth clockwise from +y). Seen from
 * above with +y up and +x right this is an ordinary right-handed plane, so "left of the direction
 * of travel" is the travel direction turned counter-clockwise, (−dy, dx).
 */

/** A point in the radar frame, metres. */
export interface Point {
  x: number;
  y: number;
}

/** Where a point falls relative to one segment. */
export interface SegmentProjection {
  /** Distance from the point to the closest point of the segment, metres (≥ 0). */
  distanceM: number;
  /** Signed perpendicular offset: positive when the point is left of the segment's direction. */
  signedOffsetM: number;
  /** Position of the closest point along the segment, 0 at its start, 1 at its end (clamped). */
  fraction: number;
  /** The closest point itself. */
  closest: Point;
}

/** z-component of the cross product a × b: positive when b is counter-clockwise of a. */
export function cross(ax: number, ay: number, bx: number, by: number): number {
  return ax * by - ay * bx;
}

/**
 * Project point p onto segment a→b. A degenerate segment (a = b) behaves like a point: the
 * fraction is 0 and the signed offset is the plain distance (there is no direction to be left of).
 */
export function projectOnSegment(p: Point, a: Point, b: Point): SegmentProjection {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  if (len2 === 0) {
    const d = Math.hypot(p.x - a.x, p.y - a.y);
    return { distanceM: d, signedOffsetM: d, fraction: 0, closest: { x: a.x, y: a.y } };
  }
  const raw = ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2;
  const fraction = Math.min(1, Math.max(0, raw));
  const closest = { x: a.x + fraction * dx, y: a.y + fraction * dy };
  const distanceM = Math.hypot(p.x - closest.x, p.y - closest.y);
  const signedOffsetM = cross(dx, dy, p.x - a.x, p.y - a.y) / Math.sqrt(len2);
  return { distanceM, signedOffsetM, fraction, closest };
}

/** Where a point falls relative to a whole polyline. */
export interface PolylineProjection {
  /** Index of the segment holding the closest point (segment i joins vertex i and i+1). */
  segment: number;
  /** Arc length from the first vertex to the closest point, metres. */
  alongM: number;
  /** Distance to the polyline, metres. */
  distanceM: number;
  /** Signed offset from the closest segment (left positive); equals ±distanceM off the ends' caps. */
  signedOffsetM: number;
}

/** Cumulative arc length at each vertex of a polyline, metres; first entry 0. */
export function cumulativeLength(vertices: readonly Point[]): number[] {
  const out = [0];
  for (let i = 1; i < vertices.length; i++) {
    out.push(out[i - 1] + Math.hypot(vertices[i].x - vertices[i - 1].x, vertices[i].y - vertices[i - 1].y));
  }
  return out;
}

/**
 * Closest point of a polyline to p, searching segments [from, to) only (default: all). Restricting
 * the search is how callers keep a projection on the right pass of a path that crosses itself.
 * Ties go to the earlier segment, so a point exactly at a vertex lands at the end of the first one.
 */
export function projectOnPolyline(
  p: Point,
  vertices: readonly Point[],
  cumulative: readonly number[] = cumulativeLength(vertices),
  from = 0,
  to = vertices.length - 1,
): PolylineProjection {
  if (vertices.length < 2) throw new RangeError('projectOnPolyline needs at least two vertices');
  let best: PolylineProjection | null = null;
  for (let i = Math.max(0, from); i < Math.min(to, vertices.length - 1); i++) {
    const s = projectOnSegment(p, vertices[i], vertices[i + 1]);
    if (best === null || s.distanceM < best.distanceM) {
      const segLen = cumulative[i + 1] - cumulative[i];
      const signed = Math.abs(s.signedOffsetM) <= s.distanceM + 1e-12 && s.fraction > 0 && s.fraction < 1
        ? s.signedOffsetM
        : Math.sign(s.signedOffsetM || 1) * s.distanceM;
      best = { segment: i, alongM: cumulative[i] + s.fraction * segLen, distanceM: s.distanceM, signedOffsetM: signed };
    }
  }
  if (best === null) throw new RangeError('projectOnPolyline: empty segment range');
  return best;
}

/** An angle (e.g. a difference of two headings) wrapped to (−π, π], radians. */
export function wrapAngle(a: number): number {
  let d = (a + Math.PI) % (2 * Math.PI);
  if (d < 0) d += 2 * Math.PI;
  return d - Math.PI === -Math.PI ? Math.PI : d - Math.PI;
}

/** Heading of a velocity, radians clockwise from +y, in [0, 2π). */
export function headingOf(vx: number, vy: number): number {
  const h = Math.atan2(vx, vy);
  return h < 0 ? h + 2 * Math.PI : h;
}
