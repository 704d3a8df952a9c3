/**
 * Number formatting for the screen. Every value leaves here with its unit, so no panel can
 * forget one; missing values read "—" rather than "NaN" or "null".
 */
const DASH = '—';
const DEG = 180 / Math.PI;

function ok(v: number | null | undefined): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

/** Angle in radians → "123.4°", normalised to [0, 360). */
export function formatAngle(rad: number | null | undefined, digits = 1): string {
  if (!ok(rad)) return DASH;
  return `${normaliseDegrees(rad * DEG).toFixed(digits)}°`;
}

/** Degrees in [0, 360); -0 and 360 fold to 0 so the list never shows "360.0°". */
export function normaliseDegrees(deg: number): number {
  const d = ((deg % 360) + 360) % 360;
  return d >= 359.99995 || Object.is(d, -0) ? 0 : d;
}

/**
 * `v.toFixed(digits)` with the minus sign (U+2212) every signed figure here uses, and no sign when
 * the value rounds to zero: "−0.00" would claim a negative the digits do not show.
 */
export function fixedWithMinus(v: number, digits: number): string {
  const text = Math.abs(v).toFixed(digits);
  return v < 0 && Number(text) !== 0 ? `−${text}` : text;
}

/** Metres; a negative value (a coordinate) takes the minus sign. */
export function formatMetres(m: number | null | undefined, digits = 2): string {
  return ok(m) ? `${fixedWithMinus(m, digits)} m` : DASH;
}

/** Signed metres keep an explicit "+" so cross/along-track errors read unambiguously. */
export function formatSignedMetres(m: number | null | undefined, digits = 3): string {
  if (!ok(m)) return DASH;
  return `${m > 0 ? '+' : m < 0 ? '−' : '±'}${Math.abs(m).toFixed(digits)} m`;
}

export function formatSpeed(mps: number | null | undefined, digits = 2): string {
  return ok(mps) ? `${mps.toFixed(digits)} m/s` : DASH;
}

/** Durations: seconds below a minute, m:ss above, always unit-marked. */
export function formatDuration(s: number | null | undefined): string {
  if (!ok(s)) return DASH;
  // Round first, then split: 59.96 s is "1 min 00 s", not "60.0 s"; 119.96 s not "1 min 60 s".
  if (Math.abs(s) < 59.95) return `${s.toFixed(1)} s`;
  const sign = s < 0 ? '−' : '';
  const whole = Math.round(Math.abs(s));
  const min = Math.floor(whole / 60);
  return `${sign}${min} min ${String(whole - min * 60).padStart(2, '0')} s`;
}

/** Timeline clock "m:ss.s" for the replay bar (the unit is in the label beside it). */
export function formatClock(s: number | null | undefined): string {
  if (!ok(s) || s < 0) return '0:00.0';
  // Round to the tenth first, then split: splitting first turned 119.97 s into "1:60.0".
  const tenths = Math.round(s * 10);
  const min = Math.floor(tenths / 600);
  const sec = (tenths - min * 600) / 10;
  return `${min}:${sec.toFixed(1).padStart(4, '0')}`;
}

export function formatMs(ms: number | null | undefined): string {
  return ok(ms) ? `${ms < 10 ? ms.toFixed(1) : ms.toFixed(0)} ms` : DASH;
}

export function formatRate(perS: number | null | undefined, unit = 'det/s'): string {
  return ok(perS) ? `${perS.toFixed(perS < 10 ? 1 : 0)} ${unit}` : DASH;
}

/** Track quality 0..1 shown as a percentage. */
export function formatQuality(q: number | null | undefined): string {
  return ok(q) ? `${Math.round(Math.min(1, Math.max(0, q)) * 100)} %` : DASH;
}

export function formatSpeedFactor(f: number | null | undefined): string {
  if (!ok(f)) return DASH;
  return `${f < 1 ? f.toFixed(2).replace(/0$/, '') : f.toFixed(f < 10 ? 1 : 0).replace(/\.0$/, '')}×`;
}

/** Short times (lags, steps): milliseconds below one second, seconds above. */
export function formatShortTime(s: number | null | undefined): string {
  if (!ok(s)) return DASH;
  return Math.abs(s) < 1 ? `${fixedWithMinus(s * 1000, 0)} ms` : `${fixedWithMinus(s, 2)} s`;
}

/** Compact age for table cells: "42 s", "76 s", "12 min". */
export function formatAge(s: number | null | undefined): string {
  if (!ok(s)) return DASH;
  return s < 600 ? `${s.toFixed(s < 10 ? 1 : 0)} s` : `${Math.floor(s / 60)} min`;
}

/** "1 track", "2 tracks", "0 tracks": a count with its noun, singular only for exactly one. */
export function formatCount(n: number, singular: string, plural = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : plural}`;
}
