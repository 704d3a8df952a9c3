// Fraction of the run with a confirmed track (common practice: "track coverage").
import { describe, expect, it } from 'vitest';
import { coverageOf } from '../../bridge/compare/coverage.ts';
import type { TrackRow } from '../../bridge/compare/track-rows.ts';

const row = (timeS: number, status: TrackRow['status'] = 'confirmed'): TrackRow => ({ timeS, id: 1, status, x: 0, y: 1, vx: 0, vy: 0, speed: 0, headingRad: 0 });

describe('coverageOf', () => {
  it('counts each update until the next, a lost stretch not at all', () => {
    // Updates every 0.5 s over 0–4 s, coasting at 1.5, nothing from 2.0 until 3.0.
    const rows = [0, 0.5, 1, 1.5, 2, 3, 3.5].map((t) => row(t, t === 1.5 ? 'coasting' : 'confirmed'));
    const c = coverageOf(rows, 0, 4);
    expect(c.gapLimitS).toBeCloseTo(0.75, 12); // 1.5 × median interval 0.5
    // confirmed: [0,1.5) = 1.5, [2, 2.75) = 0.75, [3, 4) = 1.0 → 3.25 of 4
    expect(c.confirmedFraction).toBeCloseTo(3.25 / 4, 12);
    expect(c.coastingFraction).toBeCloseTo(0.5 / 4, 12);
  });
});
