import { describe, expect, it } from 'vitest';
import { SCENARIOS, builtinScenario, crowdScenario } from '../../bridge/sim/scenarios.ts';
import { parseScenario } from '../../bridge/sim/scenario-file.ts';
import { simulateRun } from '../../bridge/sim/run.ts';

describe('built-in scenarios', () => {
  it('every one validates as a scenario file and produces target detections', () => {
    for (const name of Object.keys(SCENARIOS)) {
      const s = builtinScenario(name);
      expect(() => parseScenario(JSON.parse(JSON.stringify(s)), name)).not.toThrow();
      const run = simulateRun({ ...s, durationS: Math.min(s.durationS ?? 60, 20) });
      expect(run.origins.some((o) => o.kind === 'target'), name).toBe(true);
      expect(run.scenario.name).toBe(name);
    }
  });

  it('crowd scales with the requested count', () => {
    expect(crowdScenario(250).targets).toHaveLength(250);
    expect(builtinScenario('crowd', 12).targets).toHaveLength(12);
  });

  it('unknown names list the choices', () => {
    expect(() => builtinScenario('nope')).toThrow(/rail-sweep/);
  });
});
