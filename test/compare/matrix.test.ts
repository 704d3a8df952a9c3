// Small dense matrix helpers; inverse by Gauss–Jordan elimination with partial pivoting
// (Golub & Van Loan, "Matrix Computations", 4th ed., 2013, §3.4, from memory). Cases by hand.
import { describe, expect, it } from 'vitest';
import { identity, inverse, mul, symmetrise, transpose } from '../../bridge/compare/matrix.ts';

describe('matrix', () => {
  it('inverts a 2×2 by the adjugate formula and a matrix needing a pivot', () => {
    const a = [[4, 7], [2, 6]]; // det 10 → (1/10)[[6, −7], [−2, 4]]
    const inv = inverse(a);
    expect(inv[0][0]).toBeCloseTo(0.6, 12);
    expect(inv[0][1]).toBeCloseTo(-0.7, 12);
    expect(inv[1][0]).toBeCloseTo(-0.2, 12);
    const p = [[0, 1, 0], [1, 0, 0], [0, 0, 2]]; // zero on the first pivot
    expect(mul(p, inverse(p))).toEqual(identity(3));
  });

  it('refuses a singular matrix', () => {
    expect(() => inverse([[1, 2], [2, 4]])).toThrow(/singular/);
  });

  it('transposes and symmetrises', () => {
    expect(transpose([[1, 2, 3]])).toEqual([[1], [2], [3]]);
    expect(symmetrise([[1, 2], [4, 1]])).toEqual([[1, 3], [3, 1]]);
  });
});
