// Commanded path from positioner records: resends dropped, holds folded, units checked
// (common practice for machine-made telemetry).
import { describe, expect, it } from 'vitest';
import { positionerPoints, positionerToPath } from '../../bridge/compare/positioner.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('positionerPoints', () => {
  it('drops a resent time and folds a hold into its two ends', () => {
    const pts = positionerPoints([
      { timeS: 0, cmdX: 0, cmdY: 2 },
      { timeS: 1, cmdX: 0.5, cmdY: 2 },
      { timeS: 1, cmdX: 0.5, cmdY: 2 }, // resend
      { timeS: 2, cmdX: 0.5, cmdY: 2 },
      { timeS: 3, cmdX: 0.5, cmdY: 2 },
      { timeS: 4, cmdX: 0.5, cmdY: 2 },
      { timeS: 5, cmdX: 1, cmdY: 2 },
    ]);
    expect(pts.map((p) => [p.timeS, p.x])).toEqual([[0, 0], [1, 0.5], [4, 0.5], [5, 1]]);
  });

  it('sorts records that arrive out of order', () => {
    expect(positionerPoints([{ timeS: 1, cmdX: 1, cmdY: 2 }, { timeS: 0, cmdX: 0, cmdY: 2 }]).map((p) => p.timeS)).toEqual([0, 1]);
  });
});

describe('positionerToPath', () => {
  it('refuses millimetres and a single record', () => {
    const code = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return hasCode(e, 'E_INPUT_UNITS') ? 'units' : hasCode(e, 'E_PATH') ? 'path' : String(e);
      }
      return 'none';
    };
    expect(code(() => positionerToPath([{ timeS: 0, cmdX: 1200, cmdY: 800 }, { timeS: 1, cmdX: 1210, cmdY: 800 }]))).toBe('units');
    expect(code(() => positionerToPath([{ timeS: 0, cmdX: 1, cmdY: 1 }]))).toBe('path');
  });
});
