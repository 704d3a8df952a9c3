import { describe, expect, it } from 'vitest';
import { pageToken, withToken } from '../../web/src/stream/token.ts';

describe('bridge token', () => {
  it('reads the token from the page query and appends it to bridge URLs', () => {
    expect(pageToken('?token=a%2Bb')).toBe('a+b');
    expect(pageToken('')).toBeNull();
    expect(pageToken('?token=')).toBeNull();
    expect(withToken('ws://h/ws', 'a+b')).toBe('ws://h/ws?token=a%2Bb');
    expect(withToken('/api/sessions?x=1', 't')).toBe('/api/sessions?x=1&token=t');
    expect(withToken('/api/sessions', null)).toBe('/api/sessions');
  });
});
