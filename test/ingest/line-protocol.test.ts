import { describe, expect, it } from 'vitest';
import { crc16CcittFalse, crc16CcittFalseBitwise, crcHex } from '../../bridge/ingest/crc16.ts';
import { encodeLine, parseLine, MAX_LINE_LENGTH, type WireRecord } from '../../bridge/ingest/line-protocol.ts';

const DEG = Math.PI / 180;

/** Builds a line with a correct checksum around any body, to test what lies past the checksum. */
function withCrc(body: string): string {
  return `${body}|${crcHex(crc16CcittFalse(body))}`;
}

function reason(text: string): string {
  const r = parseLine(text, 7);
  if (r.ok) throw new Error(`expected '${text}' to be refused`);
  expect(r.bad.line).toBe(7);
  return r.bad.reason;
}

describe('CRC-16/CCITT-FALSE', () => {
  it('gives the catalogue check value for "123456789"', () => {
    // Greg Cook, "Catalogue of parametrised CRC algorithms" (reveng), CRC-16/IBM-3740 alias
    // CRC-16/CCITT-FALSE: check=0x29b1 (value from memory of the catalogue entry).
    expect(crc16CcittFalse('123456789')).toBe(0x29b1);
    expect(crc16CcittFalse(new TextEncoder().encode('123456789'))).toBe(0x29b1);
  });

  it('returns the init value 0xFFFF for no data, as the catalogue parameters imply', () => {
    expect(crc16CcittFalse('')).toBe(0xffff);
  });

  it('table-driven and bit-by-bit forms agree on random data', () => {
    let seed = 12345;
    for (let n = 0; n < 200; n++) {
      const bytes = new Uint8Array(n);
      for (let i = 0; i < n; i++) bytes[i] = (seed = (seed * 1103515245 + 12345) >>> 0) >>> 24;
      expect(crc16CcittFalse(bytes)).toBe(crc16CcittFalseBitwise(bytes));
    }
  });
});

describe('encodeLine / parseLine round trips', () => {
  const cases: WireRecord[] = [
    { kind: 'detection', detection: { timeS: 12.345678, azimuthRad: 123.4567 * DEG, rangeM: 3.2104, amplitude: 812.5 } },
    { kind: 'detection', detection: { timeS: 0, azimuthRad: 0, rangeM: 0.5, amplitude: 1e-3, phaseRad: -1.2345 } },
    { kind: 'antenna', sample: { timeS: 3599.999999, azimuthRad: 359.9999 * DEG } },
    { kind: 'positioner', sample: { timeS: 1.5, cmdX: -1.25, cmdY: 3.5 } },
    { kind: 'positioner', sample: { timeS: 1.5, cmdX: -1.25, cmdY: 3.5, measX: -1.2501, measY: 3.4998 } },
  ];
  for (const rec of cases) {
    it(`${rec.kind} survives a round trip within the printed precision`, () => {
      const line = encodeLine(rec);
      const r = parseLine(line, 1);
      if (!r.ok) throw new Error(r.bad.reason);
      expect(r.record.kind).toBe(rec.kind);
      const got = Object.values(r.record)[1] as Record<string, number>;
      const want = Object.values(rec)[1] as Record<string, number>;
      for (const [k, v] of Object.entries(want)) expect(got[k]).toBeCloseTo(v, k === 'phaseRad' ? 3 : 5);
    });
  }

  it('writes the documented layout', () => {
    const line = encodeLine({ kind: 'detection', detection: { timeS: 1.5, azimuthRad: 90 * DEG, rangeM: 2, amplitude: 40 } });
    expect(line.startsWith('det 1.500000 90.0000 2.0000 40|')).toBe(true);
    expect(line.slice(-4)).toBe(crcHex(crc16CcittFalse('det 1.500000 90.0000 2.0000 40')));
  });

  it('derives the phase from I/Q as atan2(Q, I)', () => {
    const line = encodeLine({ kind: 'detection', detection: { timeS: 1, azimuthRad: 0, rangeM: 1, amplitude: 1 } }, { iq: { i: -3, q: 4 } });
    const r = parseLine(line, 1);
    if (!r.ok || r.record.kind !== 'detection') throw new Error('refused');
    expect(r.record.detection.phaseRad).toBeCloseTo(Math.atan2(4, -3), 12);
  });

  it('wraps an azimuth that rounds to 360° to 0', () => {
    const line = encodeLine({ kind: 'antenna', sample: { timeS: 1, azimuthRad: 2 * Math.PI - 1e-9 } });
    expect(line).toContain(' 0.0000|');
    expect(parseLine(line, 1).ok).toBe(true);
  });

  it('keeps the line number on detections and tolerates a trailing CR', () => {
    const line = encodeLine({ kind: 'detection', detection: { timeS: 1, azimuthRad: 0.5, rangeM: 1, amplitude: 2 } });
    const r = parseLine(line + '\r', 42);
    if (!r.ok || r.record.kind !== 'detection') throw new Error('refused');
    expect(r.record.detection.line).toBe(42);
  });
});

describe('hostile lines are refused with a reason, never thrown', () => {
  const good = encodeLine({ kind: 'detection', detection: { timeS: 1, azimuthRad: 0.5, rangeM: 1, amplitude: 2 } });

  it('a flipped character fails the checksum', () => {
    expect(reason(good.replace('det 1.', 'det 2.'))).toMatch(/checksum mismatch/);
  });
  it('missing or malformed checksum', () => {
    expect(reason('det 1 2 3 4')).toMatch(/no checksum/);
    expect(reason('det 1 2 3 4|12G4')).toMatch(/malformed checksum/);
  });
  it('empty, oversized and binary lines', () => {
    expect(reason('')).toMatch(/empty/);
    expect(reason('x'.repeat(MAX_LINE_LENGTH + 1))).toMatch(/longer than/);
    expect(reason('det \u0000\u00ff\u0007|0000')).toMatch(/non-printable/);
    expect(reason('dét 1 2 3 4|0000')).toMatch(/non-printable/);
  });
  it('NaN, Infinity, hex and empty numbers', () => {
    expect(reason(withCrc('det NaN 10 1 1'))).toMatch(/t_s is not a number/);
    expect(reason(withCrc('det 1 Infinity 1 1'))).toMatch(/azimuth_deg is not a number/);
    expect(reason(withCrc('det 1 10 0x10 1'))).toMatch(/range_m is not a number/);
    expect(reason(withCrc('det 1 10 1e999 1'))).toMatch(/range_m is out of range/);
    expect(reason(withCrc('det 1  10 1 1'))).toMatch(/single spaces/);
  });
  it('missing fields, extra fields, values out of range', () => {
    expect(reason(withCrc('det 1 10 1'))).toMatch(/missing amplitude/);
    expect(reason(withCrc('ant 1'))).toMatch(/ant takes 2 fields/);
    expect(reason(withCrc('pos 1 2 3 4'))).toMatch(/pos takes 3 or 5 numbers/);
    expect(reason(withCrc('pos 1 2 3 4 id=2'))).toMatch(/pos takes 3 or 5 numbers \(then optionally id=<name>\), got 4/);
    expect(reason(withCrc('pos 1 2 3 id='))).toMatch(/id '' must be 1–32 letters/);
    expect(reason(withCrc('pos 1 2 3 id=a,b'))).toMatch(/id 'a,b' must be/);
    expect(reason(withCrc('pos 1 2 3 id=a id=b'))).toMatch(/id= given more than once/);
    expect(reason(withCrc('det 1 360 1 1'))).toMatch(/outside \[0, 360\)/);
    expect(reason(withCrc('det -1 10 1 1'))).toMatch(/negative/);
    expect(reason(withCrc('det 1 10 1 0'))).toMatch(/not positive/);
    expect(reason(withCrc('det 1 10 1 1 ph=200'))).toMatch(/outside \[-180, 180\]/);
    expect(reason(withCrc('det 1 10 1 1 iq=0,0'))).toMatch(/no phase/);
    expect(reason(withCrc('det 1 10 1 1 iq=1'))).toMatch(/two numbers/);
    expect(reason(withCrc('det 1 10 1 1 ph=1 iq=1,1'))).toMatch(/one of ph= or iq=/);
    expect(reason(withCrc('det 1 10 1 1 snr=3'))).toMatch(/unknown field/);
    expect(reason(withCrc('zap 1 2'))).toMatch(/unknown record type/);
  });
  it('names the positioner with id= on a bench with several, and only then', () => {
    // The example of docs/line-protocol.md.
    const r = parseLine('pos 12.350000 -0.8500 2.4000 -0.8512 2.3987 id=2|25EA', 1);
    expect(r).toEqual({ ok: true, record: { kind: 'positioner', sample: { timeS: 12.35, cmdX: -0.85, cmdY: 2.4, measX: -0.8512, measY: 2.3987, target: '2' } } });
    const plain = parseLine(encodeLine({ kind: 'positioner', sample: { timeS: 1, cmdX: 0, cmdY: 2, target: 'carriage-B' } }), 1);
    expect(plain.ok && plain.record.kind === 'positioner' && plain.record.sample).toEqual({ timeS: 1, cmdX: 0, cmdY: 2, target: 'carriage-B' });
    expect(encodeLine({ kind: 'positioner', sample: { timeS: 1, cmdX: 0, cmdY: 2 } })).not.toContain('id=');
  });
  it('cuts the echoed text to 200 characters', () => {
    const r = parseLine('y'.repeat(5000), 1);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.bad.text.length).toBe(200);
  });
});
