/**
 * The session picker's line for one recorded session: its name and start (local time, since
 * every live recording is called "live" and only the time tells two of them apart), length,
 * tracks, whether it holds a commanded path, and whether it was cut off before its summary.
 */
import type { SessionInfo } from '../../../bridge/server/protocol.ts';
import { formatCount, formatDuration } from '../stream/format.ts';

/** "YYYY-MM-DD HH:MM" in the given time zone offset (minutes east of UTC; the page's by default). */
export function localStart(startUtc: string, offsetMin = -new Date(startUtc).getTimezoneOffset()): string {
  const t = Date.parse(startUtc);
  if (!Number.isFinite(t)) return startUtc;
  const d = new Date(t + offsetMin * 60_000);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${d.getUTCFullYear()}-${p(d.getUTCMonth() + 1)}-${p(d.getUTCDate())} ${p(d.getUTCHours())}:${p(d.getUTCMinutes())}`;
}

export function sessionLabel(s: SessionInfo, offsetMin?: number): string {
  const parts = [`${formatDuration(s.durationS)}`, formatCount(s.tracks, 'track')];
  if (s.hasCommanded) parts.push('commanded path');
  if (s.closed === false) parts.push('cut off');
  return `${s.name} · ${localStart(s.startUtc, offsetMin)} — ${parts.join(', ')}`;
}
