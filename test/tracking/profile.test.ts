import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadTrackerProfile, parseTrackerProfile, profileToOptions, trackerProfileSchema } from '../../bridge/tracking/profile.ts';
import { resolveTrackerOptions } from '../../bridge/tracking/tracker.ts';
import { hasCode } from '../../bridge/errors.ts';

const dir = mkdtempSync(join(tmpdir(), 'echotrail-profile-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const DEG = Math.PI / 180;

describe('tracker profile', () => {
  it('turns degrees at the edge into radians inside and resolves to full options', () => {
    const p = parseTrackerProfile({ version: 1, measurement: { sigmaAzimuthDeg: 2, azimuthOffsetDeg: -1, rangeOffsetM: 0.12 }, filter: { kind: 'kalman', processNoise: 'cwna' }, initiation: { m: 2, n: 3 } });
    const o = resolveTrackerOptions(profileToOptions(p));
    expect(o.measurement.sigmaAzimuthRad).toBeCloseTo(2 * DEG, 12);
    expect(o.measurement.azimuthOffsetRad).toBeCloseTo(-1 * DEG, 12);
    expect(o.measurement.rangeOffsetM).toBe(0.12);
    expect(o.measurement.sigmaRangeM).toBe(0.05); // left out: default
    expect(o.filter.kind).toBe('kalman');
    expect(o.filter.processNoise).toBe('cwna');
    expect(o.initiation).toMatchObject({ m: 2, n: 3 });
    // Noise given in the profile: not re-estimated from the run.
    expect(o.estimateNoise).toBe(false);
  });

  it('refuses unknown fields, wrong versions and out-of-range values, naming the field', () => {
    const bad = [
      [{ version: 2 }, 'version'],
      [{ version: 1, filtre: {} }, '(top level)'],
      [{ version: 1, gate: { probability: 1 } }, 'gate.probability'],
      [{ version: 1, measurement: { sigmaAzimuthRad: 0.1 } }, 'measurement'],
      [{ version: 1, initiation: { m: 1.5 } }, 'initiation.m'],
    ] as const;
    for (const [json, where] of bad) {
      let err: unknown;
      try {
        parseTrackerProfile(json);
      } catch (e) {
        err = e;
      }
      expect(hasCode(err, 'E_OPTION')).toBe(true);
      expect((err as Error).message).toContain(where);
    }
    expect(trackerProfileSchema.safeParse({ version: 1 }).success).toBe(true);
  });

  it('loads a file, and says which file is not JSON or not there', async () => {
    const f = join(dir, 'p.json');
    writeFileSync(f, JSON.stringify({ version: 1, description: 'bay 3', gate: { probability: 0.995 } }));
    expect((await loadTrackerProfile(f)).gate).toEqual({ probability: 0.995 });
    writeFileSync(f, '{ nope');
    await expect(loadTrackerProfile(f)).rejects.toThrow(/not valid JSON/);
    await expect(loadTrackerProfile(join(dir, 'none.json'))).rejects.toThrow(/cannot read profile/);
  });
});
