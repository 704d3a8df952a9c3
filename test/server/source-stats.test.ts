import { describe, expect, it } from 'vitest';
import { SourceStats } from '../../bridge/server/source-stats.ts';

describe('SourceStats detection rate', () => {
  it('counts a fast replay in full: 50 × 300 detections a second', () => {
    let now = 10_000;
    const s = new SourceStats(() => now);
    s.reset('replay', 'x');
    // 15 000 detections spread over one second.
    for (let i = 0; i < 15_000; i++) s.detection(now - 1000 + (i + 0.5) / 15);
    expect(s.status().detectionsPerSecond).toBe(15_000);
    // Retained: one count per 100 ms bucket of the last second, whatever the rate.
    expect((s as unknown as { buckets: unknown[] }).buckets.length).toBeLessThanOrEqual(11);
  });

  it('follows a steady rate and falls to zero when the stream stops', () => {
    let now = 0;
    const s = new SourceStats(() => now);
    s.reset('serial', 'x');
    for (let i = 0; i < 900; i++) s.detection((now = 5000 + (i * 1000) / 300)); // 300 a second for 3 s
    expect(Math.abs(s.status().detectionsPerSecond - 300)).toBeLessThanOrEqual(3);
    now += 2000;
    expect(s.status().detectionsPerSecond).toBe(0);
  });
});

describe('SourceStats bad lines', () => {
  it('counts an entry that stands for several lines by its count, and shows the latest', () => {
    const s = new SourceStats(() => 0);
    s.reset('replay', 'x');
    s.bad({ line: 3, reason: 'range_m "abc" is not a number', text: '' });
    s.bad({ line: 180, reason: 'range_m "abc" is not a number', text: '', count: 41 });
    const st = s.status();
    expect(st.badLines).toBe(42);
    expect(st.lastBad).toMatchObject({ line: 180 });
    s.reset('replay', 'y');
    expect(s.status().badLines).toBe(0);
  });
});
