/**
 * The WebSocket protocol's client messages (bridge/server/protocol.ts): what the zod schema lets
 * through to the controls and what it refuses.
 */
import { describe, expect, it } from 'vitest';
import { clientMessage } from '../../bridge/server/protocol.ts';

describe('client messages', () => {
  it('accepts every replay control, step-back with or without a length', () => {
    for (const action of ['play', 'pause', 'step', 'step-back']) {
      expect(clientMessage.safeParse({ type: 'control', action }).success).toBe(true);
    }
    expect(clientMessage.parse({ type: 'control', action: 'step-back', value: 0.5 })).toEqual({ type: 'control', action: 'step-back', value: 0.5 });
    expect(clientMessage.safeParse({ type: 'control', action: 'seek', value: 12 }).success).toBe(true);
  });

  it('refuses unknown actions and values that are not finite numbers', () => {
    expect(clientMessage.safeParse({ type: 'control', action: 'rewind' }).success).toBe(false);
    expect(clientMessage.safeParse({ type: 'control', action: 'step-back', value: 'one turn' }).success).toBe(false);
    expect(clientMessage.safeParse({ type: 'control', action: 'step-back', value: Infinity }).success).toBe(false);
    expect(clientMessage.safeParse({ type: 'control', action: 'step-back', value: null }).success).toBe(false);
  });
});
