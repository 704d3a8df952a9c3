// The report must open without network and print (issue 5): no external references, inline CSS
// with a print stylesheet, SVG charts; figures printed in it match the analysis (common practice).
import { describe, expect, it } from 'vitest';
import { analyse } from '../../bridge/compare/analyse.ts';
import { renderReport } from '../../bridge/compare/report/html.ts';
import { esc, niceTicks } from '../../bridge/compare/report/svg.ts';
import { buildSummary, seriesCsv } from '../../bridge/compare/summary.ts';
import { waypointsToPath } from '../../bridge/compare/waypoints.ts';
import { benchRun } from './bench-run.ts';

const path = waypointsToPath([{ x: -1, y: 2 }, { x: 1, y: 2, speedMps: 0.4 }, { x: 1, y: 3.5, speedMps: 0.3 }]);
const run = benchRun(path, { seed: 2, lagS: 0.2 });
const a = analyse([path], run.rows);
const meta = { tracks: 'run<1>.csv', commanded: ['path.csv'], warnings: [] };
const html = renderReport(a, meta, { title: 'Run <1> & co', generatedUtc: '2026-01-01T00:00:00Z' });

describe('renderReport', () => {
  it('is self-contained: no scripts, no external URLs, inline style with print rules', () => {
    expect(html).not.toMatch(/<script|<link|src=|https?:\/\/(?!www\.w3\.org\/2000\/svg)/);
    expect(html).toMatch(/<style>[\s\S]*@media print[\s\S]*<\/style>/);
    expect((html.match(/<svg /g) ?? []).length).toBeGreaterThanOrEqual(6);
  });

  it('escapes input names and shows the analysis figures', () => {
    expect(html).toContain('Run &lt;1&gt; &amp; co');
    expect(html).toContain('run&lt;1&gt;.csv');
    expect(html).toContain(`${a.whole.filtered.noLag.position.rmse!.toFixed(3)} m`);
    expect(html).toContain(`${a.lag.lagS!.toFixed(3)} s`);
  });
});

describe('report wording', () => {
  // A run where the followed track 11 strayed, and where the live track's lag rounds to zero.
  const strayed = { ...a, releases: [{ timeS: 8.97, id: 11, distanceM: 2.92 }] };
  const text = (h: string) => h.replace(/<[^>]*>/g, ' ').replace(/\s+/g, ' ');

  it('says a release distance is from the commanded position, not from the path', () => {
    const h = renderReport({ ...strayed, filteredLag: { ...a.filteredLag, lagS: null } }, meta, { title: 't', generatedUtc: 'x' });
    expect(text(h)).toContain(`Track 11 strayed 2.92 m from its commanded position at 8.97 s (release distance ${a.settings.follow.releaseM.toFixed(2)} m) and stopped counting as the followed track.`);
    expect(h).not.toContain('from the commanded path at');
  });

  it('names the command instant when the follower compared with a lag', () => {
    const h = renderReport({ ...strayed, filteredLag: { ...a.filteredLag, lagS: 0.31 } }, meta, { title: 't', generatedUtc: 'x' });
    expect(text(h)).toContain(esc("from its commanded position at 8.97 s (release distance 2.00 m; compared with the command at 8.66 s to allow for the live track's 0.31 s lag)"));
  });

  it('labels the chart marker of a release readably, with the full sentence as its tooltip', () => {
    const h = renderReport(strayed, meta, { title: 't', generatedUtc: 'x' });
    expect(h).toContain('>T11 off by 2.9 m');
    expect(h).toMatch(/<line class="marker"[^>]*><title>Track 11 strayed 2\.92 m from its commanded position/);
    expect(h).not.toMatch(/id \d+ strayed/);
  });

  it('prints a lag that rounds to zero without a sign', () => {
    const h = renderReport({ ...a, lagSource: 'smoothed', filteredLag: { ...a.filteredLag, lagS: -0.001 } }, meta, { title: 't', generatedUtc: 'x' });
    expect(h).toContain('live track 0.00 s (with filter lag)');
    expect(h).not.toMatch(/[−-]0\.0+ s/);
  });
});

describe('summary and series', () => {
  it('summary carries the ratio of smoothed to filtered RMSE and one series row per followed update', () => {
    const s = buildSummary(a, meta) as { smoothed_to_filtered_rmse: number; legs: unknown[] };
    expect(s.smoothed_to_filtered_rmse).toBeCloseTo(a.whole.smoothed!.aligned.position.rmse! / a.whole.filtered.aligned.position.rmse!, 5);
    expect(s.legs).toHaveLength(a.legs.length);
    expect(seriesCsv(a).trim().split('\n')).toHaveLength(a.followed.length + 1);
  });
});

describe('svg helpers', () => {
  it('ticks on 1-2-5 steps and escaping', () => {
    expect(niceTicks(0, 1, 5)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(-0.25, 0.25, 4)).toEqual([-0.2, 0, 0.2]); // raw step 0.125 → 0.2
    expect(niceTicks(3, 370, 4)).toEqual([100, 200, 300]);
    expect(esc('"a" <b>')).toBe('&quot;a&quot; &lt;b&gt;');
  });
});
