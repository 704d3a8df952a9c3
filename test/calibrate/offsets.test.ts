import { describe, expect, it } from 'vitest';
import { fitRadarOffsets, spotFlags, type OffsetFit, type ReflectorPosition } from '../../bridge/calibrate/offsets.ts';
import { MIN_REVOLUTIONS_PER_SPOT } from '../../bridge/calibrate/guide.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import type { ScenarioOptions } from '../../bridge/sim/scenario.ts';
import { offsetsSummary } from '../../bridge/calibrate/report.ts';
import { hasCode } from '../../bridge/errors.ts';

const DEG = Math.PI / 180;
const SPOTS: ReflectorPosition[] = [{ x: 0.5, y: 1.5, label: 'A' }, { x: -1.0, y: 3.0, label: 'B' }, { x: 1.2, y: 4.8, label: 'C' }];

/** An invented calibration session: three corner reflectors, a cable-joint echo, some clutter. */
function bench(seed: number, extra: Partial<ScenarioOptions> = {}): ScenarioOptions {
  return {
    seed, durationS: 60, rangeOffsetM: 0.12, rangeScale: 1.004, azimuthOffsetDeg: 2, falseAlarmRateHz: 1,
    fixedEchoes: [{ x: 0.1, y: 0.6 }],
    targets: SPOTS.map((s) => ({ trajectory: { kind: 'static' as const, at: { x: s.x, y: s.y } } })),
    ...extra,
  };
}

/** The spots the fit singled out (range or azimuth), as the warnings and the panel name them. */
function flagged(fit: OffsetFit): string[] {
  return fit.reflectors.filter((r) => spotFlags(r).range || spotFlags(r).azimuth).map((r) => r.label);
}

/** Spots at `spots` on a bench with the usual errors; detections of a 60 s run (1 s antenna). */
function spotRun(seed: number, spots: readonly ReflectorPosition[]) {
  return simulateRun(bench(seed, { targets: spots.map((s) => ({ trajectory: { kind: 'static' as const, at: { x: s.x, y: s.y } } })) })).detections;
}

/** A tape slip: the position entered `by` metres further along its line of sight than it is. */
const further = (p: ReflectorPosition, by: number): ReflectorPosition => {
  const r = Math.hypot(p.x, p.y);
  return { ...p, x: (p.x * (r + by)) / r, y: (p.y * (r + by)) / r };
};

const FIVE: ReflectorPosition[] = [...SPOTS, { x: -0.6, y: 2.2, label: 'D' }, { x: 0.2, y: 3.8, label: 'E' }];

function failure(f: () => unknown): unknown {
  try {
    f();
  } catch (e) {
    return e;
  }
  return null;
}

describe('fitRadarOffsets on a simulated bench', () => {
  it('recovers range offset, scale and azimuth offset within 3 reported standard errors', () => {
    const fit = fitRadarOffsets(SPOTS, simulateRun(bench(1)).detections);
    expect(fit.scaleFitted).toBe(true);
    expect(Math.abs(fit.rangeOffsetM - 0.12)).toBeLessThan(3 * fit.rangeOffsetSeM);
    expect(Math.abs(fit.rangeScale - 1.004)).toBeLessThan(3 * fit.rangeScaleSe);
    expect(Math.abs(fit.azimuthOffsetRad - 2 * DEG)).toBeLessThan(3 * fit.azimuthOffsetSeRad);
    expect(fit.reflectors.map((r) => r.label)).toEqual(['A', 'B', 'C']);
    expect(fit.sigmaRangeM).toBeGreaterThan(0.04);
    expect(fit.sigmaRangeM).toBeLessThan(0.06);
  });

  it('warns about a mis-measured spot and about too few spots, and not on a good three-spot run', () => {
    const good = fitRadarOffsets(SPOTS, simulateRun(bench(1)).detections);
    expect(good.warnings).toEqual([]);
    // Spot B entered 0.2 m off across the beam (at 3.2 m: about 3.6°): only B is flagged.
    const wrong = SPOTS.map((p) => (p.label === 'B' ? { ...p, x: p.x + 0.2 } : p));
    const bad = fitRadarOffsets(wrong, simulateRun(bench(1)).detections);
    expect(bad.warnings.some((w) => w.startsWith('spot B:') && w.includes('azimuth'))).toBe(true);
    expect(flagged(bad)).toEqual(['B']);
    // Two spots: scale and offset fit the two distances exactly.
    const two = fitRadarOffsets(SPOTS.slice(0, 2), simulateRun(bench(1)).detections);
    expect(two.scaleFitted).toBe(true);
    expect(two.warnings.some((w) => w.includes('nothing left to check'))).toBe(true);
  });

  it('a large scale error (5%) does not make the robust gate drop the far reflector', () => {
    const fit = fitRadarOffsets(SPOTS, simulateRun(bench(6, { rangeScale: 1.05 })).detections);
    expect(Math.abs(fit.rangeScale - 1.05)).toBeLessThan(3 * fit.rangeScaleSe);
    expect(fit.reflectors[2].detections).toBeGreaterThan(45);
  });

  it('its standard errors are honest: z-scores over 30 seeds have unit spread', () => {
    // If the errors are right, (estimate − truth)/se is ~N(0, 1); the sample std of 30 such
    // values lies in [0.7, 1.3] with probability ≈ 0.97 (χ²(29) quantiles, common practice).
    const zr: number[] = [];
    const za: number[] = [];
    for (let seed = 100; seed < 130; seed++) {
      const f = fitRadarOffsets(SPOTS, simulateRun(bench(seed)).detections);
      zr.push((f.rangeOffsetM - 0.12) / f.rangeOffsetSeM);
      za.push((f.azimuthOffsetRad - 2 * DEG) / f.azimuthOffsetSeRad);
    }
    const sd = (v: number[]) => Math.sqrt(v.reduce((a, b) => a + b * b, 0) / v.length);
    expect(sd(zr)).toBeGreaterThan(0.6);
    expect(sd(zr)).toBeLessThan(1.4);
    expect(sd(za)).toBeGreaterThan(0.6);
    expect(sd(za)).toBeLessThan(1.4);
  });

  it('one distance: offset only; insisting on a scale is refused', () => {
    const one = [SPOTS[1]];
    const dets = simulateRun(bench(2, { rangeScale: 1, targets: [{ trajectory: { kind: 'static', at: { x: -1, y: 3 } } }] })).detections;
    const fit = fitRadarOffsets(one, dets);
    expect(fit.scaleFitted).toBe(false);
    expect(fit.rangeScale).toBe(1);
    expect(Math.abs(fit.rangeOffsetM - 0.12)).toBeLessThan(3 * fit.rangeOffsetSeM);
    const err = failure(() => fitRadarOffsets(one, dets, { fitScale: true }));
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
    expect((err as Error).message).toMatch(/two or more distances.*nothing was saved/);
  });

  it('reflectors at one distance but different azimuths give no scale either', () => {
    const ring = [{ x: 0, y: 3 }, { x: 3 * Math.sin(0.5), y: 3 * Math.cos(0.5) }];
    const dets = simulateRun(bench(3, { targets: ring.map((at) => ({ trajectory: { kind: 'static' as const, at } })) })).detections;
    const fit = fitRadarOffsets(ring, dets);
    expect(fit.scaleFitted).toBe(false);
    // Said, so that the scale of 1 is not read as a measured one; and no standard error is shown for it.
    expect(fit.warnings).toContain("range scale not fitted (held at 1): the spots' distances span 0 cm, less than 50 cm; add a spot at another distance to fit it");
    expect(offsetsSummary(fit)).not.toHaveProperty('rangeScaleSe');
    expect(offsetsSummary(fitRadarOffsets(SPOTS, simulateRun(bench(4)).detections))).toHaveProperty('rangeScaleSe');
  });

  it('no detections near an entered position: a message naming it and the nearest detection', () => {
    const wrong = [...SPOTS, { x: 2.5, y: 0.3, label: 'D' }];
    const err = failure(() => fitRadarOffsets(wrong, simulateRun(bench(4, { falseAlarmRateHz: 0 })).detections));
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
    expect((err as Error).message).toMatch(/of D .*nearest detection/);
    // With clutter a stray false alarm may fall in the wide gate: still refused, by count.
    const busy = failure(() => fitRadarOffsets(wrong, simulateRun(bench(4, { falseAlarmRateHz: 5 })).detections));
    expect(hasCode(busy, 'E_CALIBRATION')).toBe(true);
    expect((busy as Error).message).toMatch(/ D/);
    expect(hasCode(failure(() => fitRadarOffsets([], [])), 'E_CALIBRATION')).toBe(true);
  });

  it('time spans separate placements of one reflector moved during a run', () => {
    const run = simulateRun({
      seed: 5, durationS: 60, rangeOffsetM: 0.12, rangeScale: 1, azimuthOffsetDeg: 2, falseAlarmRateHz: 0,
      targets: [{ trajectory: { kind: 'waypoints', speedMps: 1, points: [{ x: 0, y: 2, dwellS: 25 }, { x: 0, y: 4 }] } }],
    });
    const fit = fitRadarOffsets([{ x: 0, y: 2, toS: 24 }, { x: 0, y: 4, fromS: 28 }], run.detections);
    expect(fit.reflectors.map((r) => r.detections).every((n) => n > 15)).toBe(true);
    expect(Math.abs(fit.rangeScale - 1)).toBeLessThan(3 * fit.rangeScaleSe);
  });

  // Leave-one-out (bridge/calibrate/spot-check.ts): each spot against what the others alone predict.
  it('leave-one-out names only the spot tape-measured 0.2 m wrong, with four and with five spots', () => {
    for (const seed of [1, 2, 3]) {
      // Four spots; B entered 0.2 m too far: its range disagrees with the others by about 0.2 m.
      const four = SPOTS.concat(FIVE[3]);
      const fit4 = fitRadarOffsets(four.map((p) => (p.label === 'B' ? further(p, 0.2) : p)), spotRun(seed, four));
      expect(flagged(fit4)).toEqual(['B']);
      const b = fit4.reflectors.find((r) => r.label === 'B')!;
      expect(b.rangeVerdict).toBe('inconsistent');
      expect(Math.abs(b.deletedRangeResidualM! + 0.2)).toBeLessThan(3 * b.deletedRangeSdM!);
      // Not "the spots disagree" either: the others are cleared.
      expect(fit4.reflectors.filter((r) => r.label !== 'B').every((r) => r.rangeVerdict === 'consistent' && r.azimuthVerdict === 'consistent')).toBe(true);
      expect(fit4.warnings.filter((w) => w.startsWith('spot ')).every((w) => w.startsWith('spot B:'))).toBe(true);
      expect(fit4.warnings.some((w) => w.includes('disagree'))).toBe(false);
      // Five spots; the far one (C, 4.95 m, the most leverage on the scale) entered 0.2 m short.
      const fit5 = fitRadarOffsets(FIVE.map((p) => (p.label === 'C' ? further(p, -0.2) : p)), spotRun(seed, FIVE));
      expect(flagged(fit5)).toEqual(['C']);
      expect(fit5.reflectors.every((r) => r.label === 'C' || (r.rangeVerdict === 'consistent' && r.azimuthVerdict === 'consistent'))).toBe(true);
    }
  });

  it('leave-one-out flags none of four or five correctly measured spots', () => {
    for (const seed of [1, 2, 3, 4, 5]) {
      for (const spots of [SPOTS.concat(FIVE[3]), FIVE]) {
        const fit = fitRadarOffsets(spots, spotRun(seed, spots));
        expect(fit.reflectors.map((r) => [r.rangeVerdict, r.azimuthVerdict])).toEqual(spots.map(() => ['consistent', 'consistent']));
        expect(fit.warnings).toEqual([]);
      }
    }
  });

  it('three spots, one 0.2 m wrong in range: the spots disagree, and more spots are asked for', () => {
    // Range scale and offset from three spots leave one residual dimension: leave-one-out cannot
    // tell which spot is wrong, so none is blamed alone.
    const fit = fitRadarOffsets(SPOTS.map((p) => (p.label === 'B' ? further(p, 0.2) : p)), simulateRun(bench(1)).detections);
    expect(fit.reflectors.map((r) => r.rangeVerdict)).toEqual(['disagree', 'disagree', 'disagree']);
    expect(fit.reflectors.some((r) => spotFlags(r).range)).toBe(false);
    expect(fit.warnings).toContain('the spots disagree in range (A, B and C beyond 3σ of what the others predict), and with 3 spots for range scale and offset leave-one-out cannot tell which is wrong: re-measure them, or add a spot at another distance');
  });

  it(`refuses a spot seen in fewer than ${MIN_REVOLUTIONS_PER_SPOT} revolutions, as the guide asks`, () => {
    const dets = simulateRun(bench(7)).detections;
    // Fifteen seconds of a 1 s antenna: about fifteen revolutions of each spot.
    const err = failure(() => fitRadarOffsets(SPOTS, dets.filter((d) => d.timeS < 15)));
    expect(hasCode(err, 'E_CALIBRATION')).toBe(true);
    expect((err as Error).message).toMatch(/^offset fit: A was seen in 1[3-6] antenna revolutions \(the guide asks for at least 20 per spot\): record longer/);
    expect(() => fitRadarOffsets(SPOTS, dets.filter((d) => d.timeS < 25))).not.toThrow();
    // A spot where nothing stands, clutter passing through its gate now and then: refused too.
    const ghost = failure(() => fitRadarOffsets([...SPOTS, { x: 0, y: 2, label: 'ghost' }], simulateRun(bench(7, { falseAlarmRateHz: 25 })).detections));
    expect(hasCode(ghost, 'E_CALIBRATION')).toBe(true);
    expect((ghost as Error).message).toMatch(/^offset fit: ghost was seen in \d antenna revolutions .*check the entered position; nothing was saved$/);
  });
});
