import { describe, expect, it } from 'vitest';
import { wireRecords } from '../../bridge/sim/wire-records.ts';
import { iterateRun } from '../../bridge/sim/run.ts';
import { resolveScenarioOptions } from '../../bridge/sim/scenario.ts';
import { SCENARIOS } from '../../bridge/sim/scenarios.ts';

describe('wireRecords (what feed and demo send)', () => {
  it('pairs each positioner record with the command of the same instant, not the one before', () => {
    const sc = resolveScenarioOptions({ ...SCENARIOS['rail-sweep'], durationS: 20, seed: 5 });
    // The commanded points of the first target, by time, straight from the run.
    const commanded = new Map<number, { x: number; y: number }>();
    for (const r of iterateRun(sc)) if (r.kind === 'commanded' && r.targetId === sc.targets[0].id) commanded.set(r.point.timeS, r.point);
    let n = 0;
    let moving = 0;
    let last = -Infinity;
    for (const r of wireRecords(sc, 0, 10)) {
      const t = r.kind === 'detection' ? r.detection.timeS : r.sample.timeS;
      expect(t).toBeGreaterThanOrEqual(last - 1e-9); // still in time order
      last = t;
      if (r.kind !== 'positioner') continue;
      const c = commanded.get(r.sample.timeS)!;
      expect(c).toBeDefined();
      expect(r.sample.cmdX).toBe(c.x);
      expect(r.sample.cmdY).toBe(c.y);
      n++;
      const prev = commanded.get(Math.round((r.sample.timeS - 0.1) * 1e6) / 1e6);
      if (prev && (prev.x !== c.x || prev.y !== c.y)) moving++;
    }
    expect(n).toBeGreaterThan(100);
    // Not vacuous: the command changes between samples for much of the run.
    expect(moving).toBeGreaterThan(20);
  });
});
