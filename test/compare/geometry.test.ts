// Point-to-segment projection: the vector-projection construction in Schneider & Eberly,
// "Geometric Tools for Computer Graphics" (2003), §6.1 (section number from memory). The cases
// below are worked by hand (3-4-5 triangles), not taken from the book.
import { describe, expect, it } from 'vitest';
import { cumulativeLength, headingOf, projectOnPolyline, projectOnSegment, wrapAngle } from '../../bridge/compare/geometry.ts';

describe('projectOnSegment', () => {
  const a = { x: 0, y: 0 };
  const b = { x: 4, y: 0 }; // travelling +x: left is +y

  it('gives the perpendicular distance and the foot inside the segment', () => {
    const p = projectOnSegment({ x: 1, y: 3 }, a, b);
    expect(p.distanceM).toBeCloseTo(3, 12);
    expect(p.fraction).toBeCloseTo(0.25, 12);
    expect(p.closest).toEqual({ x: 1, y: 0 });
  });

  it('is positive on the left of the direction of travel and negative on the right', () => {
    expect(projectOnSegment({ x: 2, y: 1.5 }, a, b).signedOffsetM).toBeCloseTo(1.5, 12);
    expect(projectOnSegment({ x: 2, y: -1.5 }, a, b).signedOffsetM).toBeCloseTo(-1.5, 12);
    // Reversing the segment swaps the sides.
    expect(projectOnSegment({ x: 2, y: 1.5 }, b, a).signedOffsetM).toBeCloseTo(-1.5, 12);
  });

  it('measures to the nearer end beyond the segment (3-4-5 triangle)', () => {
    const p = projectOnSegment({ x: 7, y: 4 }, a, b);
    expect(p.distanceM).toBeCloseTo(5, 12);
    expect(p.fraction).toBe(1);
  });

  it('treats a zero-length segment as a point', () => {
    const p = projectOnSegment({ x: 3, y: 4 }, a, a);
    expect(p.distanceM).toBeCloseTo(5, 12);
    expect(p.fraction).toBe(0);
  });

  it('uses the radar frame: heading north (+y), east (+x) is on the right', () => {
    expect(projectOnSegment({ x: 1, y: 1 }, { x: 0, y: 0 }, { x: 0, y: 2 }).signedOffsetM).toBeCloseTo(-1, 12);
  });
});

describe('projectOnPolyline', () => {
  // An L: 4 m east, then 3 m north; arc length 7 m.
  const L = [{ x: 0, y: 0 }, { x: 4, y: 0 }, { x: 4, y: 3 }];

  it('accumulates the arc length of the vertices', () => {
    expect(cumulativeLength(L)).toEqual([0, 4, 7]);
  });

  it('gives the along-track position of a point beside the second leg', () => {
    const p = projectOnPolyline({ x: 3, y: 2 }, L);
    expect(p.segment).toBe(1);
    expect(p.alongM).toBeCloseTo(6, 12); // 4 m of the first leg + 2 m up the second
    expect(p.distanceM).toBeCloseTo(1, 12);
    expect(p.signedOffsetM).toBeCloseTo(1, 12); // heading north, x = 3 is on the left (west)
  });

  it('gives the along-track position of a point beside the first leg on the right', () => {
    const p = projectOnPolyline({ x: 1.5, y: -0.5 }, L);
    expect(p.segment).toBe(0);
    expect(p.alongM).toBeCloseTo(1.5, 12);
    expect(p.signedOffsetM).toBeCloseTo(-0.5, 12);
  });

  it('keeps to the requested segments, for paths that pass the same place twice', () => {
    const p = projectOnPolyline({ x: 3, y: 0.5 }, L, undefined, 1, 2);
    expect(p.segment).toBe(1);
    expect(p.alongM).toBeCloseTo(4.5, 12);
  });
});

describe('angles', () => {
  it('headings are clockwise from +y (docs/conventions.md)', () => {
    expect(headingOf(0, 1)).toBeCloseTo(0, 12);
    expect(headingOf(1, 0)).toBeCloseTo(Math.PI / 2, 12);
    expect(headingOf(-1, 0)).toBeCloseTo((3 * Math.PI) / 2, 12);
  });
  it('wraps a difference across north', () => {
    expect(wrapAngle(headingOf(-0.1, 1) - headingOf(0.1, 1))).toBeCloseTo(-2 * Math.atan(0.1), 12);
  });
});
