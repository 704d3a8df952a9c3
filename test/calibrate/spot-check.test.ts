// Tests bridge/calibrate/spot-check.ts on hand-made spot means (no noise, so every figure is exact).
import { describe, expect, it } from 'vitest';
import { checkSpots, deletedResidual, type SpotObservation } from '../../bridge/calibrate/spot-check.ts';

/** Spots at these true ranges, measured = 1.004·R + 0.12, each 1 cm uncertain; `errors` added to their means. */
function rangeSpots(ranges: number[], errors: number[] = []): SpotObservation[] {
  return ranges.map((r, i) => ({ x: [r, 1], y: 1.004 * r + 0.12 + (errors[i] ?? 0), v: 0.01 ** 2 }));
}

/** An offset alone (x = [1]): means 2° + error, each 0.2° uncertain. */
function offsetSpots(errors: number[]): SpotObservation[] {
  return errors.map((e) => ({ x: [1], y: 2 + e, v: 0.2 ** 2 }));
}

describe('deleted residuals', () => {
  it('compare a spot with the fit of the others, with their prediction variance', () => {
    // Offset alone, three spots: the others' mean is 2, its variance 0.2²/2; the spot adds 0.2².
    const obs = offsetSpots([0.9, 0, 0]);
    const d = deletedResidual(obs, [0, 1, 2], 0)!;
    expect(d.residual).toBeCloseTo(0.9, 12);
    expect(d.sd).toBeCloseTo(Math.sqrt(0.04 / 2 + 0.04), 12);
  });

  it('are undetermined when the others cannot fit the parameters (one distance left for a scale)', () => {
    const obs = rangeSpots([2, 2, 4]);
    expect(deletedResidual(obs, [0, 1, 2], 2)).toBeNull();
    expect(deletedResidual(obs, [0, 1, 2], 0)).not.toBeNull();
  });
});

describe('checkSpots', () => {
  it('flags nothing when the spots agree', () => {
    const c = checkSpots(rangeSpots([1.5, 2.3, 3.2, 3.9, 4.9], [0.004, -0.006, 0.002, 0.008, -0.005]));
    expect(c.verdicts).toEqual(['consistent', 'consistent', 'consistent', 'consistent', 'consistent']);
    expect(c.redundancy).toBe(3);
  });

  it('singles out the one wrong spot of five, though its pull makes the others miss the common fit too', () => {
    const c = checkSpots(rangeSpots([1.5, 2.3, 3.2, 3.9, 4.9], [0, 0, 0.2, 0, 0]));
    expect(c.verdicts).toEqual(['consistent', 'consistent', 'inconsistent', 'consistent', 'consistent']);
    // No noise: the other four fit the line exactly, so spot 3 is off by exactly its error.
    expect(c.deleted[2]!.residual).toBeCloseTo(0.2, 10);
  });

  it('three spots for two parameters: the spots disagree, and no one of them can be told', () => {
    // One residual dimension: every studentized deleted residual has the same size.
    const c = checkSpots(rangeSpots([1.5, 3.2, 4.9], [0, 0.2, 0]));
    const t = c.deleted.map((d) => Math.abs(d!.residual / d!.sd));
    expect(t[0]).toBeCloseTo(t[1], 9);
    expect(t[1]).toBeCloseTo(t[2], 9);
    expect(c.verdicts).toEqual(['disagree', 'disagree', 'disagree']);
    expect(c.pointsAt).toBeNull();
    expect(c.redundancy).toBe(1);
  });

  it('three spots for one parameter: removing the wrong one leaves two that agree', () => {
    const c = checkSpots(offsetSpots([0, 3, 0.1]));
    expect(c.verdicts).toEqual(['consistent', 'inconsistent', 'consistent']);
  });

  it('two wrong spots of seven: backward deletion names both', () => {
    const c = checkSpots(offsetSpots([0, 3, 0.1, -0.1, -2.5, 0.05, 0]));
    expect(c.verdicts.map((v, i) => (v === 'inconsistent' ? i : -1)).filter((i) => i >= 0)).toEqual([1, 4]);
  });

  it('no redundancy: nothing checked', () => {
    expect(checkSpots(rangeSpots([1.5, 4.9], [0.3, 0])).verdicts).toEqual(['unchecked', 'unchecked']);
    expect(checkSpots(offsetSpots([5])).verdicts).toEqual(['unchecked']);
  });
});
