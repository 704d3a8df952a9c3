/** The bench's coverage as drawn on the plan: a range annulus and (optionally) an azimuth sector. */
export interface Coverage {
  /** Blind range near the antenna, metres. */
  minRangeM: number;
  /** Furthest usable range, metres. */
  maxRangeM: number;
  /** Sector start and end, radians clockwise from +y; equal values mean a full turn. */
  sectorStartRad: number;
  sectorEndRad: number;
}

export const defaultCoverage: Coverage = { minRangeM: 0.3, maxRangeM: 8, sectorStartRad: 0, sectorEndRad: 0 };

export function isFullTurn(c: Coverage): boolean {
  const span = ((c.sectorEndRad - c.sectorStartRad) % (2 * Math.PI) + 2 * Math.PI) % (2 * Math.PI);
  return span === 0;
}

/** Points (world, metres) along an arc of radius r from az0 to az1, clockwise from +y. */
export function arcPoints(r: number, az0: number, az1: number, stepRad = Math.PI / 90): { x: number; y: number }[] {
  let span = az1 - az0;
  if (span <= 0) span += 2 * Math.PI;
  const n = Math.max(2, Math.ceil(span / stepRad) + 1);
  const pts: { x: number; y: number }[] = [];
  for (let i = 0; i < n; i++) {
    const az = az0 + (span * i) / (n - 1);
    pts.push({ x: r * Math.sin(az), y: r * Math.cos(az) });
  }
  return pts;
}
