import { describe, expect, it } from 'vitest';
import {
  formatAngle, formatClock, formatDuration, formatMetres, formatMs, formatQuality, formatShortTime,
  formatCount, formatSignedMetres, formatSpeed, formatSpeedFactor, normaliseDegrees,
} from '../../web/src/stream/format.ts';

describe('formatting with units', () => {
  it('puts the unit on every number', () => {
    expect(formatMetres(2.345)).toBe('2.35 m');
    // Coordinates left of or below the radar: the minus sign (U+2212), never a hyphen; no "−0.00".
    expect(formatMetres(-1.5)).toBe('−1.50 m');
    expect(formatMetres(-0.001)).toBe('0.00 m');
    expect(formatSpeed(0.6)).toBe('0.60 m/s');
    expect(formatMs(1.84)).toBe('1.8 ms');
    expect(formatMs(42.4)).toBe('42 ms');
    expect(formatQuality(0.634)).toBe('63 %');
    expect(formatShortTime(0.12)).toBe('120 ms');
    expect(formatShortTime(1.5)).toBe('1.50 s');
    // Negative lags use the minus sign like every other signed figure, never a hyphen.
    expect(formatShortTime(-0.001)).toBe('−1 ms');
    expect(formatShortTime(-1.25)).toBe('−1.25 s');
    expect(formatShortTime(-0.0001)).toBe('0 ms');
  });

  it('shows a dash for missing values instead of NaN or null', () => {
    for (const f of [formatMetres, formatSpeed, formatAngle, formatMs, formatQuality, formatDuration]) {
      expect(f(null)).toBe('—');
      expect(f(NaN)).toBe('—');
    }
  });

  it('turns radians into degrees in [0, 360)', () => {
    expect(formatAngle(Math.PI / 2)).toBe('90.0°');
    expect(formatAngle(-Math.PI / 2)).toBe('270.0°');
    expect(formatAngle(2 * Math.PI - 1e-9)).toBe('0.0°');
    expect(normaliseDegrees(-0)).toBe(0);
  });

  it('signs errors explicitly', () => {
    expect(formatSignedMetres(0.0125)).toBe('+0.013 m');
    expect(formatSignedMetres(-0.2)).toBe('−0.200 m');
  });

  it('formats durations, the replay clock and speed factors', () => {
    expect(formatDuration(9.26)).toBe('9.3 s');
    // Rounded before being split into minutes and seconds.
    expect(formatDuration(59.96)).toBe('1 min 00 s');
    expect(formatDuration(119.96)).toBe('2 min 00 s');
    expect(formatDuration(61.4)).toBe('1 min 01 s');
    expect(formatDuration(125)).toBe('2 min 05 s');
    expect(formatClock(65.25)).toBe('1:05.3');
    expect(formatClock(-1)).toBe('0:00.0');
    // A time just short of the minute rolls over whole: never "1:60.0".
    expect(formatClock(119.997)).toBe('2:00.0');
    expect(formatClock(59.94)).toBe('0:59.9');
    expect(formatClock(59.95)).toBe('1:00.0');
    expect(formatSpeedFactor(0.25)).toBe('0.25×');
    expect(formatSpeedFactor(0.1)).toBe('0.1×');
    expect(formatSpeedFactor(1)).toBe('1×');
    expect(formatSpeedFactor(50)).toBe('50×');
  });
});

describe('formatAge', async () => {
  const { formatAge } = await import('../../web/src/stream/format.ts');
  it('keeps table ages short and unit-marked', () => {
    expect(formatAge(4.26)).toBe('4.3 s');
    expect(formatAge(76.4)).toBe('76 s');
    expect(formatAge(725)).toBe('12 min');
    expect(formatAge(NaN)).toBe('—');
  });
});

describe('formatCount', () => {
  it('says "1 track" and "2 tracks" (the session picker said "1 tracks")', () => {
    expect(formatCount(1, 'track')).toBe('1 track');
    expect(formatCount(0, 'track')).toBe('0 tracks');
    expect(formatCount(2, 'track')).toBe('2 tracks');
    expect(formatCount(1, 'detection')).toBe('1 detection');
  });
});
