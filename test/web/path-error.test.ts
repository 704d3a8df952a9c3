import { describe, expect, it } from 'vitest';
import { commandedAt, errorSeries } from '../../web/src/stream/path-error.ts';
import { HistoryRing } from '../../web/src/stream/ring.ts';
import { pathWindow } from '../../web/src/plan/path-window.ts';

const path = [{ timeS: 0, x: 0, y: 1 }, { timeS: 2, x: 2, y: 1 }, { timeS: 4, x: 2, y: 3 }];

describe('commanded path error', () => {
  it('interpolates the commanded point in time and is null outside the path', () => {
    expect(commandedAt(path, 1)).toEqual({ x: 1, y: 1 });
    expect(commandedAt(path, 3)).toEqual({ x: 2, y: 2 });
    expect(commandedAt(path, -0.1)).toBeNull();
    expect(commandedAt(path, 4.1)).toBeNull();
    expect(commandedAt([], 0)).toBeNull();
  });

  it('measures a constant 0.1 m offset as 0.1 m at every compared sample', () => {
    const h = new HistoryRing(16);
    for (let t = 0; t <= 5; t += 0.5) {
      const c = commandedAt(path, t);
      h.push({ timeS: t, x: (c?.x ?? 9) + 0.06, y: (c?.y ?? 9) + 0.08, speed: 1, headingRad: 0 });
    }
    const e = errorSeries(h, path);
    expect(e.t).toEqual([0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4]);
    for (const v of e.v) expect(v).toBeCloseTo(0.1, 12);
    expect(errorSeries(h, path, 3).t).toEqual([3, 3.5, 4]);
  });
});

describe('commanded path window', () => {
  const p = Array.from({ length: 11 }, (_, i) => ({ timeS: i, x: i, y: 0 }));
  it('keeps the points inside the window and one on each side', () => {
    expect(pathWindow(p, 3.5, 6).map((q) => q.timeS)).toEqual([3, 4, 5, 6, 7]);
    expect(pathWindow(p, -Infinity, Infinity)).toHaveLength(11);
    expect(pathWindow(p, 20, 30).map((q) => q.timeS)).toEqual([10]);
    expect(pathWindow([], 0, 1)).toEqual([]);
  });
});
