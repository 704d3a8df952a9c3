import { describe, expect, it } from 'vitest';
import { ReleaseQueue } from '../../bridge/tracking/release-queue.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Detection } from '../../bridge/types.ts';

const det = (timeS: number): Detection => ({ timeS, azimuthRad: 0, rangeM: 1, amplitude: 1 });

describe('release queue', () => {
  it('gives back exactly the detections due, in time order, whatever the order they were held in', () => {
    const rng = createRng(3);
    const q = new ReleaseQueue();
    const held: { d: Detection; at: number }[] = [];
    for (let k = 0; k < 200; k++) {
      const d = det(rng.uniform() * 10);
      const at = d.timeS + rng.uniform();
      q.push(d, at);
      held.push({ d, at });
    }
    const out: Detection[] = [];
    q.takeDue(5, out);
    const expected = held.filter((h) => h.at <= 5).map((h) => h.d).sort((a, b) => a.timeS - b.timeS);
    expect(out).toEqual(expected);
    expect(q.size).toBe(200 - expected.length);
    expect(q.next).toBe(Math.min(...held.filter((h) => h.at > 5).map((h) => h.at)));
    const rest = q.drain();
    expect(rest.length).toBe(200 - expected.length);
    for (let k = 1; k < rest.length; k++) expect(rest[k].timeS).toBeGreaterThanOrEqual(rest[k - 1].timeS);
    expect(q.next).toBe(Infinity);
  });
});
