/** HTML tables of the report: whole-run figures and per-leg figures. */
import type { Analysis, SummaryPair } from '../analyse.ts';
import type { DeviationSummary, ErrorFigures } from '../stats.ts';
import { esc, reportNumber } from './svg.ts';

/** A number for a table cell or a sentence: fixed digits (signs as reportNumber), an en dash for "no value". */
export function cell(v: number | null | undefined, digits = 3): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '–' : reportNumber(v.toFixed(digits));
}

const QUANTITIES: { key: keyof DeviationSummary; label: string; digits: number; signed: boolean }[] = [
  { key: 'position', label: 'position error, m', digits: 3, signed: false },
  { key: 'along', label: 'along-track (ahead +), m', digits: 3, signed: true },
  { key: 'cross', label: 'cross-track (left +), m', digits: 3, signed: true },
  { key: 'speed', label: 'speed error, m/s', digits: 3, signed: true },
  { key: 'headingDeg', label: 'heading error, °', digits: 1, signed: true },
];

function figRow(label: string, f: ErrorFigures, digits: number): string {
  return `<tr><td>${esc(label)}</td><td>${f.n}</td><td>${cell(f.rmse, digits)}</td><td>${cell(f.mean, digits)}</td><td>${cell(f.max, digits)}</td><td>${cell(f.p95, digits)}</td></tr>`;
}

/** Whole-run table: each quantity for filtered/smoothed × raw/lag-aligned. */
export function wholeRunTable(a: Analysis): string {
  const variants: [string, SummaryPair | null][] = [['filtered (live track)', a.whole.filtered], ['smoothed (RTS)', a.whole.smoothed]];
  const rows: string[] = [];
  for (const q of QUANTITIES) {
    rows.push(`<tr><td class="group" colspan="6">${esc(q.label)}${q.signed ? ' — max and p95 of |error|' : ''}</td></tr>`);
    for (const [name, pair] of variants) {
      if (!pair) continue;
      rows.push(figRow(`${name}, as recorded`, pair.noLag[q.key], q.digits));
      rows.push(figRow(`${name}, lag removed`, pair.aligned[q.key], q.digits));
    }
  }
  return `<table><thead><tr><th>quantity / estimate</th><th>n</th><th>RMSE</th><th>mean</th><th>max</th><th>p95</th></tr></thead><tbody>${rows.join('')}</tbody></table>`;
}

/** Per-leg table: position RMSE and p95, mean along and cross, for both estimates (lag removed and not). */
export function legTable(a: Analysis, maxRows = 200): string {
  // A long looping run has hundreds of legs; summary.json keeps them all, the page the first ones.
  const rows = a.perLeg.slice(0, maxRows).map(({ leg, filtered, smoothed }) => {
    const f = filtered.noLag;
    const fa = filtered.aligned;
    const s = smoothed?.aligned;
    return `<tr><td>${leg.index + 1} · ${leg.kind}</td><td>${cell(leg.startS, 1)}–${cell(leg.endS, 1)}</td><td>${cell(leg.lengthM, 2)}</td><td>${cell(leg.speedMps, 2)}</td>` +
      `<td>${f.position.n}</td><td>${cell(f.position.rmse)}</td><td>${cell(fa.position.rmse)}</td><td>${cell(s?.position.rmse)}</td>` +
      `<td>${cell(fa.position.p95)}</td><td>${cell(fa.along.mean)}</td><td>${cell(fa.cross.mean)}</td><td>${cell(s?.cross.mean)}</td></tr>`;
  });
  return `<table><thead><tr><th>leg</th><th>time, s</th><th>length, m</th><th>speed, m/s</th><th>n</th>` +
    `<th>RMSE raw</th><th>RMSE lag removed</th><th>RMSE smoothed</th><th>p95 lag removed</th><th>mean along</th><th>mean cross</th><th>mean cross smoothed</th></tr></thead>` +
    `<tbody>${rows.join('')}</tbody></table>` +
    (a.perLeg.length > maxRows ? `<p class="note">First ${maxRows} of ${a.perLeg.length} legs shown; summary.json holds all of them.</p>` : '');
}
