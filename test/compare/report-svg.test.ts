// The report's chart helpers: tick choice and marker labels that do not print over each other.
import { describe, expect, it } from 'vitest';
import { niceTicks, placeMarkerLabels, reportNumber, timePlot } from '../../bridge/compare/report/svg.ts';
import { cell } from '../../bridge/compare/report/tables.ts';

describe('niceTicks', () => {
  it('labels at least three values when the range allows (a ±194° heading chart labelled only 0)', () => {
    expect(niceTicks(-194, 194, 3)).toEqual([-100, 0, 100]);
    expect(niceTicks(-0.3, 0.3, 3).length).toBeGreaterThanOrEqual(3);
    expect(niceTicks(0, 10, 5)).toEqual([0, 2, 4, 6, 8, 10]);
  });
  it('a heading-error chart shows values besides 0 on its y axis', () => {
    const svg = timePlot([{ name: 'h', color: '#000', points: [[0, -180], [1, 179], [2, 3]] }], { id: 'h', width: 500, height: 200, xLabel: 'time, s', yLabel: 'heading error, °', symmetric: true, zeroLine: true });
    const yTicks = [...svg.matchAll(/text-anchor="end">([^<]*)</g)].map((m) => m[1]);
    expect(yTicks.filter((t) => t !== '0').length).toBeGreaterThanOrEqual(2);
  });
});

describe('placeMarkerLabels', () => {
  const sx = (v: number) => v * 10; // 10 px a second
  it('labels a burst of switches once, with the count of the hidden ones; every line keeps its text', () => {
    const m = [{ x: 10, label: 'id 9→20' }, { x: 10.5, label: 'id 20→9' }, { x: 11, label: 'id 9→20' }, { x: 50, label: 'id 20→21' }];
    const out = placeMarkerLabels(m, sx);
    expect(out.map((o) => o.label)).toEqual(['id 9→20 (+2 more)', '', '', 'id 20→21']);
    expect(out.map((o) => o.title)).toEqual(m.map((x) => x.label));
  });
  it('uses a marker\'s own tooltip when it has one', () => {
    const out = placeMarkerLabels([{ x: 1, label: 'T11 off by 2.9 m', title: 'Track 11 strayed 2.92 m from its commanded position' }], sx);
    expect(out).toEqual([{ x: 1, label: 'T11 off by 2.9 m', title: 'Track 11 strayed 2.92 m from its commanded position' }]);
  });
});

describe('report numbers', () => {
  it('print negatives with the minus sign U+2212 and values that round to zero without a sign', () => {
    expect(cell(-0.001, 2)).toBe('0.00');
    expect(cell(-0, 2)).toBe('0.00');
    expect(cell(-0.4, 0)).toBe('0');
    expect(cell(-0.005, 2)).toBe('−0.01'); // (-0.005).toFixed(2) rounds away from zero: a real −0.01
    expect(cell(-1.25, 3)).toBe('−1.250');
    expect(cell(0.004, 2)).toBe('0.00');
    expect(cell(null)).toBe('–');
    expect(reportNumber('-0.000')).toBe('0.000');
    expect(reportNumber('-3.0e-3')).toBe('−3.0e−3');
  });
  it('chart ticks use the same minus sign', () => {
    const svg = timePlot([{ name: 'e', color: '#000', points: [[0, -0.3], [1, 0.3]] }], { id: 'e', width: 500, height: 200, xLabel: 'time, s', yLabel: 'error, m', symmetric: true });
    const yTicks = [...svg.matchAll(/text-anchor="end">([^<]*)</g)].map((m) => m[1]);
    expect(yTicks.some((t) => t.startsWith('−'))).toBe(true);
    expect(yTicks.join(' ')).not.toContain('-');
  });
});
