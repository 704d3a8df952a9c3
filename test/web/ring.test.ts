import { describe, expect, it } from 'vitest';
import { HistoryRing } from '../../web/src/stream/ring.ts';

const pt = (t: number) => ({ timeS: t, x: t * 2, y: -t, speed: 1, headingRad: 0 });

describe('HistoryRing', () => {
  it('keeps the newest `capacity` points and numbers them without reuse', () => {
    const r = new HistoryRing(4);
    for (let i = 0; i < 10; i++) r.push(pt(i));
    expect(r.length).toBe(4);
    expect(r.pushed).toBe(10);
    expect(r.firstSeq).toBe(6);
    expect([6, 7, 8, 9].map((s) => r.at(s).timeS)).toEqual([6, 7, 8, 9]);
    expect(r.last()).toEqual(pt(9));
  });

  it('refuses sequence numbers that fell out or never existed', () => {
    const r = new HistoryRing(3);
    for (let i = 0; i < 5; i++) r.push(pt(i));
    expect(() => r.at(1)).toThrow(RangeError);
    expect(() => r.at(5)).toThrow(RangeError);
  });

  it('finds the first point at or after a time across the wrap', () => {
    const r = new HistoryRing(5);
    for (let i = 0; i < 8; i++) r.push(pt(i * 0.5));
    // held: seq 3..7 → t 1.5, 2, 2.5, 3, 3.5
    expect(r.seqAtOrAfter(2.2)).toBe(5);
    expect(r.seqAtOrAfter(0)).toBe(3);
    expect(r.seqAtOrAfter(99)).toBe(8);
  });

  it('rejects a non-positive capacity', () => {
    expect(() => new HistoryRing(0)).toThrow(RangeError);
  });
});
