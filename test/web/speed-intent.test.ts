import { describe, expect, it } from 'vitest';
import { SpeedIntent } from '../../web/src/panels/speed-intent.ts';

describe('SpeedIntent', () => {
  it('three quick presses of ] climb three steps before the bridge answers', () => {
    const s = new SpeedIntent();
    expect(s.step(1, 1, 0)).toBe(2);
    expect(s.step(1, 1, 50)).toBe(5);
    expect(s.step(1, 1, 100)).toBe(10);
  });

  it('steps from the reported speed once the request is carried out or has gone stale', () => {
    const s = new SpeedIntent();
    expect(s.step(1, 1, 0)).toBe(2);
    s.reported(2);
    expect(s.step(5, -1, 100)).toBe(2);
    // Never answered (refused): after a while the bridge's own value counts again.
    expect(s.step(1, 1, 5000)).toBe(2);
  });
});
