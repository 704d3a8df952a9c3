import { describe, expect, it } from 'vitest';
import { loopTitle } from '../../web/src/panels/loop-text.ts';

describe('loopTitle', () => {
  it('says the button loops the current session, and what the demo list does', () => {
    expect(loopTitle({ loop: false })).toBe('Loop the current session (L). Off: this session stops at its end.');
    const off = loopTitle({ loop: false, playlist: { index: 1, count: 4, loops: true } });
    expect(off).toMatch(/^Loop the current session/);
    expect(off).toMatch(/moves on to the next session \(this is 2 of 4; after the last one the list starts over\)/);
    expect(loopTitle({ loop: true, playlist: { index: 0, count: 4, loops: true } })).toMatch(/starts over when it ends.*waits until the loop is off/);
  });
});
