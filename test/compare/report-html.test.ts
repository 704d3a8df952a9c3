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
