import { describe, expect, it } from 'vitest';
import { HistoryRing } from '../../web/src/stream/ring.ts';
import { trackSeries } from '../../web/src/stream/track-series.ts';

function ring(times: number[]): HistoryRing {
  const r = new HistoryRing(100);
  for (const t of times) r.push({ timeS: t, x: t, y: 0, speed: 0.2, headingRad: Math.PI / 2 });
  return r;
}

describe('trackSeries', () => {
  it('keeps the last windowS seconds up to now', () => {
    const s = trackSeries(ring([1, 2, 3, 4, 5]), 5, 2.5);
    expect(s.t).toEqual([3, 4, 5]);
    expect(s.speed).toEqual([0.2, 0.2, 0.2]);
    expect(s.headingDeg[0]).toBeCloseTo(90, 9);
  });

  it('after a seek back, a clock still ahead of the reloaded history does not empty the charts', () => {
    // History reloaded at 10–12 s while the clock still reads 59 s (the reviewer's empty charts).
    const s = trackSeries(ring([10, 10.5, 11, 11.5, 12]), 59, 30);
    expect(s.t).toEqual([10, 10.5, 11, 11.5, 12]);
  });

  it('an empty history gives empty series', () => {
    expect(trackSeries(new HistoryRing(4), 3, 10).t).toEqual([]);
  });
});
