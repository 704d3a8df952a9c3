import { mkdtemp, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadScenarioFile, parseScenario } from '../../bridge/sim/scenario-file.ts';

describe('scenario files', () => {
  it('reads a valid file', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-scn-'));
    const path = join(dir, 's.json');
    await writeFile(path, JSON.stringify({ version: 1, durationS: 5, targets: [{ trajectory: { kind: 'circle', center: { x: 0, y: 3 }, radiusM: 0.5, periodS: 10 } }] }));
    const s = await loadScenarioFile(path);
    expect(s.durationS).toBe(5);
    expect(s.targets?.[0].trajectory.kind).toBe('circle');
  });

  it('names the bad field', () => {
    expect(() => parseScenario({ targets: [{ trajectory: { kind: 'circle', center: { x: 0, y: 3 }, radiusM: -1, periodS: 10 } }] })).toThrow(/targets\.0\.trajectory\.radiusM/);
    expect(() => parseScenario({ durationS: 5, speling: 1 })).toThrow(/speling|unrecognized/i);
  });

  it('says when the file is not JSON or missing', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-scn-'));
    const path = join(dir, 'bad.json');
    await writeFile(path, '{ not json');
    await expect(loadScenarioFile(path)).rejects.toThrow(/not valid JSON/);
    await expect(loadScenarioFile(join(dir, 'none.json'))).rejects.toThrow(/cannot read/);
  });
});
