import { describe, expect, it } from 'vitest';
import { Ring } from '../../bridge/server/ring.ts';

describe('Ring', () => {
  it('keeps the newest `capacity` items, oldest first', () => {
    const r = new Ring<number>(3);
    for (let i = 1; i <= 5; i++) r.push(i);
    expect(r.toArray()).toEqual([3, 4, 5]);
    expect(r.length).toBe(3);
    expect(r.peek()).toBe(3);
  });

  it('shifts and drops from the old end', () => {
    const r = new Ring<number>(4);
    [1, 2, 3, 4, 5].forEach((i) => r.push(i));
    expect(r.shift()).toBe(2);
    r.dropWhile((x) => x < 4);
    expect(r.toArray()).toEqual([4, 5]);
    r.push(6);
    r.push(7);
    r.push(8);
    expect(r.toArray()).toEqual([5, 6, 7, 8]);
    r.clear();
    expect(r.toArray()).toEqual([]);
    expect(r.shift()).toBeUndefined();
  });

  it('refuses a capacity that is not a positive integer', () => {
    expect(() => new Ring(0)).toThrow(RangeError);
    expect(() => new Ring(2.5)).toThrow(RangeError);
  });
});
