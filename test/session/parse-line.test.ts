/** The hand-written detection check must agree with the zod schema of format.ts, line for line. */
import { describe, expect, it } from 'vitest';
import { parseSessionLine } from '../../bridge/session/parse-line.ts';
import { fromLine, sessionLine } from '../../bridge/session/format.ts';

const raw = (o: unknown) => ({ text: JSON.stringify(o), offset: 100, line: 7, bytes: JSON.stringify(o).length });
const base = { k: 'det', timeS: 1.5, azimuthRad: 0.25, rangeM: 3, amplitude: 8 };

const cases: unknown[] = [
  base,
  { ...base, phaseRad: -1 },
  { ...base, line: 12 },
  { ...base, line: 1.5 },
  { ...base, timeS: '1.5' },
  { ...base, rangeM: null },
  { ...base, amplitude: undefined },
  { ...base, phaseRad: 'x' },
  { ...base, extra: 1 },
  { k: 'det' },
  // Bounds of the line protocol and the detections CSV.
  { ...base, rangeM: -0.5 },
  { ...base, rangeM: 0 },
  { ...base, amplitude: 0 },
  { ...base, amplitude: -3 },
  { ...base, k: 'ant' },
];

describe('parseSessionLine', () => {
  for (const c of cases) {
    it(`agrees with the schema on ${JSON.stringify(c)}`, () => {
      const got = parseSessionLine(raw(c));
      const z = sessionLine.safeParse(JSON.parse(JSON.stringify(c)));
      if (!z.success) {
        expect(typeof got).toBe('string');
        expect(got).toContain(z.error.issues[0].message);
      } else {
        expect(got).toEqual({ timeS: 1.5, record: fromLine(z.data), line: 7, offset: 100 });
      }
    });
  }

  it('refuses a negative range or a non-positive amplitude', () => {
    expect(parseSessionLine(raw({ ...base, rangeM: -0.5 }))).toBe('rangeM: range must not be negative');
    expect(parseSessionLine(raw({ ...base, amplitude: 0 }))).toBe('amplitude: amplitude must be positive');
  });

  it('refuses broken JSON and oversized lines with a reason', () => {
    expect(parseSessionLine({ text: '{"k":', offset: 0, line: 3, bytes: 5 })).toBe('not valid JSON');
    expect(parseSessionLine({ text: '', offset: 0, line: 3, bytes: 9e6, oversized: 9e6 })).toMatch(/too long/);
  });
});
