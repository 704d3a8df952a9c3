// summary.json numbers carry no binary float noise.
import { describe, expect, it } from 'vitest';
import { roundForJson } from '../../bridge/compare/summary.ts';

describe('roundForJson', () => {
  it('rounds to 1e-6 and prints the shortest decimal', () => {
    const text = JSON.stringify({ a: 0.23720000000000008, b: [0.1 + 0.2, 3, -1.0000004], c: 'x', d: null, e: 1e-9 }, roundForJson);
    expect(text).toBe('{"a":0.2372,"b":[0.3,3,-1],"c":"x","d":null,"e":0}');
  });
});
