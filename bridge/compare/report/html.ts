/**
 * The run report: one self-contained HTML file (inline CSS and SVG, no scripts, no network) with
 * the key figures, the paths overlaid in plan, errors over time, OSPA/GOSPA, the lag search and
 * the tables. Printable: the print stylesheet drops backgrounds and keeps figures whole.
 */
import type { Analysis } from '../analyse.ts';
import type { SummaryMeta } from '../summary.ts';
import { REPORT_CSS } from './style.ts';
import { cell, legTable, wholeRunTable } from './tables.ts';
import { esc, planPlot, timePlot, type Marker, type Series } from './svg.ts';

/** Report settings. */
export interface ReportOptions {
  /** Title line. */
  title: string;
  /** When it was generated (ISO 8601 UTC); passed in so the output is reproducible in tests. */
  generatedUtc: string;
}

const C = { cmd: '#0f7c74', trk: '#d2641c', smo: '#6a3fb5', alt: '#2f6fb3', miss: '#b3261e', fal: '#c99a06' };

function legend(items: { name: string; color: string; dash?: boolean }[]): string {
  return `<div class="legend">${items.map((i) => `<span><i class="${i.dash ? 'dash' : ''}" style="border-top-color:${i.color}"></i>${esc(i.name)}</span>`).join('')}</div>`;
}

function figure(caption: string, svg: string, items: { name: string; color: string; dash?: boolean }[]): string {
  // Width from the chart, so a long caption wraps instead of widening the figure.
  const w = /width="(\d+)"/.exec(svg.slice(0, 300))?.[1];
  return `<figure${w ? ` style="width:${Number(w) + 18}px"` : ''}>${legend(items)}${svg}<figcaption>${esc(caption)}</figcaption></figure>`;
}

function card(cls: string, k: string, v: string, n: string): string {
  return `<div class="card ${cls}"><div class="k">${esc(k)}</div><div class="v">${v}</div><div class="n">${esc(n)}</div></div>`;
}

/** Break lines across gaps longer than `gapS` so a lost track is not drawn as a straight jump. */
function withGaps(points: [number, number][], times: number[], gapS: number): [number, number][] {
  const out: [number, number][] = [];
  points.forEach((p, i) => {
    if (i > 0 && times[i] - times[i - 1] > gapS) out.push([NaN, NaN]);
    out.push(p);
  });
  return out;
}

/** The lag card's figure: the lag, or "not significant" when its interval holds zero. */
function lagValue(a: Analysis): string {
  const i = a.lagInterval;
  if (a.lag.lagS === null) return '–';
  if (i?.undetermined) return 'undetermined';
  if (i && !i.significant) return 'not significant';
  // No interval (too few samples): the figure is only a rough estimate, and must not read as firm.
  return `${i ? '' : '≈ '}${cell(a.lag.lagS, 2)} s`;
}

/** Under the lag card's figure: the interval, on which track, and the live track's own lag. */
function lagNote(a: Analysis): string {
  if (a.lag.lagS === null) return 'path does not move';
  const i = a.lagInterval;
  const ci = i ? `${Math.round(i.level * 100)} % CI ${cell(i.lowS, 2)}…${cell(i.highS, 2)} s` : 'too few samples for an interval';
  const est = i && !i.significant && !i.undetermined ? `estimate ${cell(a.lag.lagS, 3)} s, ` : '';
  const live = a.lagSource === 'smoothed' && a.filteredLag.lagS !== null ? `; live track ${cell(a.filteredLag.lagS, 2)} s (with filter lag)` : '';
  return `${est}${ci}, ${a.lagSource} track${live}`;
}

/**
 * The lag the follower compared with when it picked the followed track (analyse.ts picks again with
 * the live track's lag once that is known), seconds; 0 when it compared at equal times.
 */
function followLagS(a: Analysis): number {
  return a.filteredLag.lagS || 0;
}

/**
 * Why a track lost the followed role. The distance is to the commanded position at that instant
 * (shifted by the follow lag), not to the nearest point of the path: a track that runs on the path
 * but far behind the command strays too.
 */
function releaseSentence(a: Analysis, r: Analysis['releases'][number]): string {
  const lagS = followLagS(a);
  const shifted = lagS === 0 ? '' : `; compared with the command at ${cell(r.timeS - lagS, 2)} s to allow for the live track's ${cell(lagS, 2)} s lag`;
  return `Track ${r.id} strayed ${cell(r.distanceM, 2)} m from its commanded position at ${cell(r.timeS, 2)} s (release distance ${cell(a.settings.follow.releaseM, 2)} m${shifted}) and stopped counting as the followed track.`;
}

/** Chart markers: changes of the followed track and releases, in the dashboard's "T<id>" naming. */
function followMarkers(a: Analysis): Marker[] {
  return [
    ...a.switches.slice(1).map((s) => ({
      x: s.timeS,
      label: s.from === null ? `→ T${s.to}` : `T${s.from}→T${s.to}`,
      title: `followed track ${s.from === null ? '(none)' : s.from} → ${s.to} at ${cell(s.timeS, 2)} s`,
    })),
    ...a.releases.map((r) => ({ x: r.timeS, label: `T${r.id} off by ${cell(r.distanceM, 1)} m`, title: releaseSentence(a, r) })),
  ];
}

/** Render the report. */
export function renderReport(a: Analysis, meta: SummaryMeta, o: ReportOptions): string {
  const rows = a.followed;
  const times = rows.map((r) => r.timeS);
  const gap = Math.max(a.coverage.gapLimitS, 1e-6) * 2;
  const sm = a.smoothed;
  const smTimes = sm ? sm.states.map((s) => s.timeS) : [];
  const wf = a.whole.filtered;
  const ws = a.whole.smoothed;
  const ratio = ws && wf.aligned.position.rmse ? (ws.aligned.position.rmse ?? NaN) / wf.aligned.position.rmse : null;
  const markers = followMarkers(a);

  const cards = [
    card('trk', 'position RMSE, filtered', `${cell(wf.noLag.position.rmse)} m`, `lag removed ${cell(wf.aligned.position.rmse)} m`),
    card('smo', 'position RMSE, smoothed', `${cell(ws?.aligned.position.rmse)} m`, ratio !== null ? `× ${cell(ratio, 2)} of filtered (lag removed)` : 'no measurement columns'),
    card('cmd', 'lag behind command', lagValue(a), lagNote(a)),
    card('', 'max error / p95', `${cell(wf.noLag.position.max, 2)} m`, `p95 ${cell(wf.noLag.position.p95)} m (raw)`),
    card('', 'confirmed track', `${cell(a.coverage.confirmedFraction * 100, 1)} %`, `of the run; coasting ${cell(a.coverage.coastingFraction * 100, 1)} %`),
    card('', 'mean GOSPA', `${cell(a.setSummary.meanGospaM)} m`, `mean OSPA ${cell(a.setSummary.meanOspaM)} m`),
  ].join('');

  const cmdPts: [number, number][] = a.commanded.points.map((p) => [p.x, p.y]);
  const plan = planPlot(
    [
      { name: 'tracked (filtered)', color: C.trk, points: withGaps(rows.map((r) => [r.x, r.y]), times, gap), width: 1.3 },
      ...(sm ? [{ name: 'smoothed', color: C.smo, points: withGaps(sm.states.map((s): [number, number] => [s.x, s.y]), smTimes, gap), width: 1.3, dash: true }] : []),
      // Drawn last: on a long looping run the estimates would bury the reference otherwise.
      { name: 'commanded', color: C.cmd, points: cmdPts, width: 2.2 },
    ],
    { id: 'plan', width: 540, height: 480, xLabel: 'x, m (radar frame)', yLabel: 'y, m' },
    [
      { x: cmdPts[0][0], y: cmdPts[0][1], label: 'commanded start', color: C.cmd },
      ...a.switches.slice(1).flatMap((s) => {
        const r = rows.find((q) => q.timeS === s.timeS && q.id === s.to);
        return r ? [{ x: r.x, y: r.y, label: `followed track ${s.from ?? '(none)'} → ${s.to} at ${cell(s.timeS, 2)} s`, color: C.miss }] : [];
      }),
    ],
  );

  const series = (f: (i: number) => number, color: string, name: string, dash = false): Series => ({ name, color, dash, points: withGaps(rows.map((r, i) => [r.timeS, f(i)]), times, gap) });
  const smSeries = (f: (k: number) => number, color: string, name: string): Series[] =>
    sm ? [{ name, color, dash: true, points: withGaps(sm.states.map((s, k) => [s.timeS, f(k)]), smTimes, gap) }] : [];

  const errPlot = timePlot(
    // The raw line drawn wide underneath: with a small lag the two filtered lines coincide, and the
    // thin one on top would otherwise hide the raw one completely.
    [{ ...series((i) => a.filtered.noLag[i].positionM, C.trk, 'filtered, raw'), width: 3 }, series((i) => a.filtered.aligned[i].positionM, C.alt, 'filtered, lag removed'),
      ...smSeries((k) => sm!.deviations.aligned[k].positionM, C.smo, 'smoothed, lag removed')],
    { id: 'err', width: 1038, height: 240, xLabel: 'time, s', yLabel: 'position error, m', markers },
  );
  const acPlot = (key: 'alongM' | 'crossM', label: string, id: string) => timePlot(
    [{ ...series((i) => a.filtered.noLag[i][key], C.trk, 'filtered, raw'), width: 3 }, series((i) => a.filtered.aligned[i][key], C.alt, 'filtered, lag removed'),
      ...smSeries((k) => sm!.deviations.aligned[k][key], C.smo, 'smoothed, lag removed')],
    { id, width: 500, height: 220, xLabel: 'time, s', yLabel: label, zeroLine: true, symmetric: true, markers },
  );
  const spPlot = timePlot([series((i) => a.filtered.aligned[i].speedMps ?? NaN, C.trk, 'speed error'), ...smSeries((k) => sm!.deviations.aligned[k].speedMps ?? NaN, C.smo, 'smoothed')], { id: 'spd', width: 500, height: 200, xLabel: 'time, s', yLabel: 'speed error, m/s', zeroLine: true, symmetric: true });
  const degOrGap = (h: number | null | undefined): number => (h === null || h === undefined ? NaN : (h * 180) / Math.PI);
  const hdPlot = timePlot([series((i) => degOrGap(a.filtered.aligned[i].headingRad), C.trk, 'heading error'), ...smSeries((k) => degOrGap(sm!.deviations.aligned[k].headingRad), C.smo, 'smoothed')], { id: 'hdg', width: 500, height: 200, xLabel: 'time, s', yLabel: 'heading error, °', zeroLine: true, symmetric: true });
  const setPts = (f: (s: (typeof a.sets)[number]) => number): [number, number][] => a.sets.map((s) => [s.timeS, f(s)]);
  const setPlot = timePlot(
    [{ name: 'GOSPA', color: C.smo, points: setPts((s) => s.gospaM), width: 2 }, { name: 'OSPA', color: C.cmd, points: setPts((s) => s.ospaM) },
      { name: '√ localisation part', color: C.alt, points: setPts((s) => Math.sqrt(s.localisation)), dash: true },
      { name: '√ missed part', color: C.miss, points: setPts((s) => Math.sqrt(s.missed)), dash: true },
      { name: '√ false part', color: C.fal, points: setPts((s) => Math.sqrt(s.false)), dash: true }],
    { id: 'sets', width: 1038, height: 220, xLabel: 'time, s', yLabel: 'metres' },
  );
  const lagCurves: Series[] = [{ name: `RMS distance, ${a.lagSource} track`, color: a.lagSource === 'smoothed' ? C.smo : C.trk, points: a.lag.curve.map((c) => [c.lagS, c.rmsM]), width: 2 }];
  if (a.lagSource === 'smoothed' && a.filteredLag.curve.length) lagCurves.push({ name: 'RMS distance, filtered track', color: C.trk, points: a.filteredLag.curve.map((c) => [c.lagS, c.rmsM]), dash: true });
  const ci = a.lagInterval;
  const lagPlot = a.lag.curve.length
    ? timePlot(lagCurves,
      { id: 'lag', width: 470, height: 260, xLabel: 'candidate lag, s (track behind command +)', yLabel: 'RMS distance, m',
        markers: a.lag.lagS === null ? [] : [{ x: a.lag.lagS, label: `${cell(a.lag.lagS, 3)} s` }],
        band: ci ? { from: ci.lowS, to: ci.highS, label: `${Math.round(ci.level * 100)} % confidence interval of the lag` } : undefined })
    : '<p class="note">The commanded path does not move over the compared samples: no lag can be estimated.</p>';

  const warnings = [...meta.warnings];
  if (a.coverage.confirmedFraction < 0.8) warnings.push(`The target was held by a confirmed track for only ${cell(a.coverage.confirmedFraction * 100, 0)} % of the run.`);
  if (!sm) warnings.push('The tracks carry no measurement columns: no smoothed figures.');
  for (const r of a.releases) warnings.push(releaseSentence(a, r));

  const ids = a.switches.map((s) => s.to);
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(o.title)}</title><style>${REPORT_CSS}</style></head>
<body><main>
<header class="run"><h1>${esc(o.title)}</h1>
<div class="sub">tracks: ${esc(meta.tracks)} · commanded: ${esc(meta.commanded.join(', '))} · run ${cell(a.commanded.points[0].timeS, 1)}–${cell(a.commanded.points[a.commanded.points.length - 1].timeS, 1)} s, ${cell(a.commanded.cumulativeM[a.commanded.cumulativeM.length - 1], 2)} m commanded · followed track id${ids.length > 1 ? 's' : ''} ${esc(ids.join(' → ') || '–')}</div></header>
${warnings.length ? `<p class="note warn">${warnings.map(esc).join('<br>')}</p>` : ''}
<section class="cards">${cards}</section>
<h2>Paths in the radar frame</h2>
<div class="row">${figure(`Commanded path (the dot in its colour: where it starts), the followed track as the live view showed it, and the smoothed track.${a.switches.length > 1 ? ' Red dots: where the followed track changed (hover one for which).' : ''}`, plan,
    [{ name: 'commanded', color: C.cmd }, { name: 'tracked (filtered)', color: C.trk }, ...(sm ? [{ name: 'smoothed', color: C.smo, dash: true }] : [])])}
<div style="flex:1;min-width:300px">${figure(`Least-squares lag search: RMS distance between the ${a.lagSource} track and the commanded path shifted by each candidate lag; shaded: the lag's ${ci ? Math.round(ci.level * 100) : 95} % confidence interval (moving-block bootstrap over the samples).`, lagPlot,
    [{ name: `${a.lagSource} track`, color: a.lagSource === 'smoothed' ? C.smo : C.trk }, ...(lagCurves.length > 1 ? [{ name: 'filtered track', color: C.trk, dash: true }] : [])])}
<p class="note">The lag is estimated on the ${a.lagSource === 'smoothed' ? 'RTS-smoothed track, which has no filter lag: it is the positioner’s latency and timing offset' : 'filtered (live) track: it includes the filter’s own lag on turns and speed changes'}. “Not significant”: the interval holds zero. “Lag removed” figures compare the track at t with the command at t − lag${a.lagSource === 'smoothed' ? '; the live filter trails by a lag of its own on top of it, so its “lag removed” RMSE need not be smaller than its raw one, and may read a few mm larger' : ''}.</p></div></div>
<h2>Error over time</h2>
${figure('Euclidean distance between the estimate and the commanded position.', errPlot, [{ name: 'filtered, raw', color: C.trk }, { name: 'filtered, lag removed', color: C.alt }, ...(sm ? [{ name: 'smoothed, lag removed', color: C.smo, dash: true }] : [])])}
<div class="row" style="margin-top:12px">${figure('Along-track error: positive ahead of the commanded point.', acPlot('alongM', 'along-track, m', 'along'), [{ name: 'filtered, raw', color: C.trk }, { name: 'lag removed', color: C.alt }, ...(sm ? [{ name: 'smoothed', color: C.smo, dash: true }] : [])])}
${figure('Cross-track error: positive left of the commanded direction of travel.', acPlot('crossM', 'cross-track, m', 'cross'), [{ name: 'filtered, raw', color: C.trk }, { name: 'lag removed', color: C.alt }, ...(sm ? [{ name: 'smoothed', color: C.smo, dash: true }] : [])])}</div>
<div class="row" style="margin-top:12px">${figure('Track speed minus commanded speed (lag removed).', spPlot, [{ name: 'filtered', color: C.trk }, ...(sm ? [{ name: 'smoothed', color: C.smo, dash: true }] : [])])}
${figure('Track heading minus commanded heading (lag removed); blank while either stands still.', hdPlot, [{ name: 'filtered', color: C.trk }, ...(sm ? [{ name: 'smoothed', color: C.smo, dash: true }] : [])])}</div>
<h2>Figures for the whole run</h2>
${wholeRunTable(a)}
<h2>Figures per leg</h2>
<p class="note">Legs: straight runs between corners and holds of the commanded path (or the legs named in the input).</p>
${legTable(a)}
<h2>All tracks against all commanded targets</h2>
${figure(`OSPA (Schuhmacher, Vo & Vo 2008) and GOSPA with α = 2 (Rahmathullah, García-Fernández & Svensson 2017), c = ${cell(a.setOptions.cutoffM, 2)} m, p = ${a.setOptions.order}, grid ${cell(a.setOptions.stepS, 2)} s; estimates: every confirmed or coasting track of a moving reflector. The GOSPA parts are drawn as square roots so that they share the metre scale.`, setPlot,
    [{ name: 'GOSPA', color: C.smo }, { name: 'OSPA', color: C.cmd }, { name: 'localisation', color: C.alt, dash: true }, { name: 'missed', color: C.miss, dash: true }, { name: 'false', color: C.fal, dash: true }])}
<p class="note">Means over ${a.setSummary.samples} instants: OSPA ${cell(a.setSummary.meanOspaM)} m, GOSPA ${cell(a.setSummary.meanGospaM)} m; GOSPA² parts: localisation ${cell(a.setSummary.meanLocalisation, 4)}, missed ${cell(a.setSummary.meanMissed, 4)}, false ${cell(a.setSummary.meanFalse, 4)} m².</p>
<footer>echotrail compare · generated ${esc(o.generatedUtc)} · settings: follow gate ${a.settings.follow.gateM} m, release ${a.settings.follow.releaseM} m, lag search ±${a.settings.lag.maxLagS} s (step ${a.settings.lag.stepS} s), smoother q̃ ${a.settings.smoother.accelPsd} m²/s³, corner ${a.settings.legs.cornerDeg}° · smoother: fixed-interval Rauch–Tung–Striebel (1965) over a constant-velocity Kalman filter run on the tracker's measurements · all positions in the radar frame (x = r·sin az, y = r·cos az).</footer>
</main></body></html>
`;
}
