import { describe, expect, it } from 'vitest';
import { LineSplitter } from '../../bridge/ingest/line-splitter.ts';
import { resolveSerialOptions } from '../../bridge/ingest/serial-options.ts';

const b = (s: string) => Buffer.from(s, 'latin1');

describe('LineSplitter', () => {
  it('joins lines split across chunks and numbers them', () => {
    const s = new LineSplitter(100);
    expect(s.push(b('ab'))).toEqual([]);
    expect(s.push(b('c\nde\n\nf'))).toEqual([
      { line: 1, text: 'abc' },
      { line: 2, text: 'de' },
      { line: 3, text: '' },
    ]);
    expect(s.push(b('g\n'))).toEqual([{ line: 4, text: 'fg' }]);
  });

  it('refuses an over-long line as soon as it passes the cap and drops the rest of it', () => {
    const s = new LineSplitter(64);
    const first = s.push(b('x'.repeat(50)));
    expect(first).toEqual([]);
    const over = s.push(b('y'.repeat(50)));
    expect(over.length).toBe(1);
    expect(over[0]).toMatchObject({ line: 1, oversized: 100 });
    // More junk of the same line: nothing new, nothing kept.
    expect(s.push(b('z'.repeat(10_000)))).toEqual([]);
    expect(s.push(b('zz\nok\n'))).toEqual([{ line: 2, text: 'ok' }]);
  });

  it('keeps non-ASCII bytes visible (latin1) so the parser can refuse them', () => {
    const s = new LineSplitter(64);
    const [l] = s.push(Buffer.from([0x61, 0xff, 0x00, 0x0a]));
    expect([...l.text].map((c) => c.charCodeAt(0))).toEqual([0x61, 0xff, 0x00]);
  });

  it('reset() reports and forgets an unfinished line, which keeps its own number', () => {
    const s = new LineSplitter(64);
    expect(s.push(b('first\nhalf a li'))).toEqual([{ line: 1, text: 'first' }]);
    expect(s.reset()).toEqual({ line: 2, bytes: 9 });
    expect(s.push(b('ne\n'))).toEqual([{ line: 3, text: 'ne' }]);
    // Nothing unfinished: no line is consumed.
    expect(s.reset()).toBeNull();
    expect(s.push(b('next\n'))).toEqual([{ line: 4, text: 'next' }]);
  });
});

describe('resolveSerialOptions', () => {
  it('fills the defaults and keeps what is given', () => {
    expect(resolveSerialOptions({ path: '/dev/ttyUSB0' })).toMatchObject({ baudRate: 115200, dataBits: 8, parity: 'none', stopBits: 1, maxLineBytes: 4096, presenceCheckMs: 1000 });
    expect(resolveSerialOptions({ path: '/dev/x', baudRate: 921600, parity: 'even', dataBits: 7, stopBits: 2 })).toMatchObject({ baudRate: 921600, parity: 'even', dataBits: 7, stopBits: 2 });
  });
  it('refuses impossible settings with E_OPTION and a reason', () => {
    expect(() => resolveSerialOptions({ path: '' })).toThrow(/device path/);
    expect(() => resolveSerialOptions({ path: '/dev/x', baudRate: -3 })).toThrow(/baud/);
    expect(() => resolveSerialOptions({ path: '/dev/x', parity: 'sometimes' as never })).toThrow(/parity must be one of/);
    expect(() => resolveSerialOptions({ path: '/dev/x', dataBits: 9 as never })).toThrow(/data bits/);
    expect(() => resolveSerialOptions({ path: '/dev/x', reopenInitialMs: 500, reopenMaxMs: 100 })).toThrow(/reopen/);
    expect(() => resolveSerialOptions({ path: '/dev/x', presenceCheckMs: -1 })).toThrow(/presence check/);
  });
});
