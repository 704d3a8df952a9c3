import { describe, expect, it } from 'vitest';
import { calibrationApi } from '../../bridge/calibrate/api.ts';
import { parseBenchConfig } from '../../bridge/calibrate/bench-config.ts';
import { parseTrackerProfile } from '../../bridge/tracking/profile.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { builtinScenario } from '../../bridge/sim/scenarios.ts';
import type { Detection } from '../../bridge/types.ts';

const wire = (ds: Detection[]) => ds.map((d) => ({ timeS: d.timeS, azimuthDeg: (d.azimuthRad * 180) / Math.PI, rangeM: d.rangeM, amplitude: d.amplitude }));

describe('calibrationApi', () => {
  it('offsets → a proposed bench config with the fit and a history entry', () => {
    const tape = simulateRun(builtinScenario('tape-points'));
    const res = calibrationApi({ action: 'offsets', positions: [{ x: 0.5, y: 1.5, label: 'A' }, { x: -1, y: 3 }, { x: 1.2, y: 4.8 }], detections: wire(tape.detections), measuredBy: 'panel test' });
    if (!res.ok || res.action !== 'offsets') throw new Error(JSON.stringify(res));
    expect(Math.abs(res.summary.azimuthOffsetDeg - 2)).toBeLessThan(3 * res.summary.azimuthOffsetSeDeg);
    expect(res.reflectors[0].label).toBe('A');
    const cfg = parseBenchConfig(res.config);
    expect(cfg.history[0]).toMatchObject({ kind: 'offsets', measuredBy: 'panel test' });
    expect(cfg.radar.azimuthOffsetDeg).toBe(res.summary.azimuthOffsetDeg);
    // The panel shows the fit's warnings: none for three good spots, one for a mis-entered spot.
    expect(res.warnings).toEqual([]);
    const wrong = calibrationApi({ action: 'offsets', positions: [{ x: 0.5, y: 1.5, label: 'A' }, { x: -1.3, y: 3, label: 'B' }, { x: 1.2, y: 4.8 }], detections: wire(tape.detections) });
    if (!wrong.ok || wrong.action !== 'offsets') throw new Error(JSON.stringify(wrong));
    expect(wrong.warnings.some((w) => w.startsWith('spot B:'))).toBe(true);
    // Each spot's row says whether it is beyond its noise, as the warnings do (the panel marks it).
    expect(res.reflectors.map((r) => [r.rangeBeyondNoise, r.azimuthBeyondNoise])).toEqual([[false, false], [false, false], [false, false]]);
    const b = wrong.reflectors.find((r) => r.label === 'B')!;
    expect(b.rangeBeyondNoise || b.azimuthBeyondNoise).toBe(true);
    expect(wrong.reflectors.filter((r) => r.rangeBeyondNoise || r.azimuthBeyondNoise).length).toBe(new Set(wrong.warnings.filter((w) => w.startsWith('spot ')).map((w) => w.split(':')[0])).size);
    // The row carries the leave-one-out figure its warning quotes (degrees at this edge), and the
    // verdict behind the flag.
    expect(b.azimuthVerdict).toBe('inconsistent');
    const deg = b.deletedAzimuthResidualDeg as number;
    expect(wrong.warnings.find((w) => w.startsWith('spot B: azimuth'))).toContain(`${deg < 0 ? '−' : ''}${Math.abs(deg).toFixed(2)}°`);
    expect(res.reflectors.every((r) => typeof r.deletedAzimuthSdDeg === 'number' && r.rangeVerdict === 'consistent')).toBe(true);
  });

  it('offsets: refuses a capture shorter than the guide asks for (20 revolutions per spot)', () => {
    const tape = simulateRun(builtinScenario('tape-points'));
    const short = calibrationApi({ action: 'offsets', positions: [{ x: 0.5, y: 1.5, label: 'A' }, { x: -1, y: 3 }], detections: wire(tape.detections.filter((d) => d.timeS < 8)) });
    expect(short).toMatchObject({ ok: false, code: 'E_CALIBRATION' });
    expect((short as { message: string }).message).toMatch(/A was seen in \d antenna revolutions \(the guide asks for at least 20 per spot\)/);
  });

  it('frame and tune, chained through the returned config', () => {
    const run = simulateRun(builtinScenario('offsets-check'));
    const config = { version: 1, bench: 'bay 3', updatedUtc: '2026-12-02T02:00:00.000Z', radar: { rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2 }, positionerFrame: { rotationDeg: 0, translationM: { x: 0, y: 0 } }, history: [] };
    const commanded = run.commanded[0].points;
    const frame = calibrationApi({ action: 'frame', detections: wire(run.detections), commanded, config });
    if (!frame.ok || frame.action !== 'frame') throw new Error(JSON.stringify(frame));
    expect(Math.abs(frame.summary.rotationDeg - 3)).toBeLessThan(3 * frame.summary.rotationSeDeg);
    const tune = calibrationApi({ action: 'tune', detections: wire(run.detections), commanded, config: frame.config, profileName: 'bay3' });
    if (!tune.ok || tune.action !== 'tune') throw new Error(JSON.stringify(tune));
    expect(tune.summary.nisVerdict).toBe('consistent');
    expect(() => parseTrackerProfile(tune.profile)).not.toThrow();
    expect(tune.config.history.map((h) => h.kind)).toEqual(['frame', 'noise']);
    // a track (here the truth) instead of detections: used whole, no gating
    const byTrack = calibrationApi({ action: 'frame', track: run.truth.map((t) => ({ timeS: t.timeS, x: t.x, y: t.y })), commanded, config });
    if (!byTrack.ok || byTrack.action !== 'frame') throw new Error(JSON.stringify(byTrack));
    expect(byTrack.summary.rotationDeg).toBeCloseTo(3, 6);
    expect(calibrationApi({ action: 'frame', commanded, config })).toMatchObject({ ok: false, code: 'E_PROTOCOL' });
  });

  it('validates the request and reports degenerate input without throwing', () => {
    const bad = calibrationApi({ action: 'offsets', positions: [], detections: [] });
    expect(bad).toMatchObject({ ok: false, code: 'E_PROTOCOL' });
    expect((bad as { message: string }).message).toMatch(/positions/);
    expect(calibrationApi({ action: 'nope' })).toMatchObject({ ok: false, code: 'E_PROTOCOL' });
    expect(calibrationApi(null)).toMatchObject({ ok: false });
    const none = calibrationApi({ action: 'offsets', positions: [{ x: 0, y: 2 }], detections: [{ timeS: 0, azimuthDeg: 90, rangeM: 4 }] });
    expect(none).toMatchObject({ ok: false, code: 'E_CALIBRATION' });
  });

  it('gives the guide and NIS bounds', () => {
    expect(calibrationApi({ action: 'steps' })).toMatchObject({ ok: true, action: 'steps' });
    // n = 2, N = 50 → [1.4844, 2.5912]: χ²_{nN} quantiles / N (Bar-Shalom, Li & Kirubarajan 2001, §5.4; NIST/SEMATECH χ² table)
    const b = calibrationApi({ action: 'nis-bounds', count: 50 });
    if (!b.ok || b.action !== 'nis-bounds') throw new Error('no bounds');
    expect(b.lower).toBeCloseTo(1.4844, 4);
    expect(b.upper).toBeCloseTo(2.5912, 4);
  });
});
