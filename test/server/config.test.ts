import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { bridgeOptionsFromConfig, loadBenchConfig } from '../../bridge/config.ts';
import { hasCode } from '../../bridge/errors.ts';

const dir = mkdtempSync(join(tmpdir(), 'et-config-'));
function file(name: string, content: unknown): string {
  const p = join(dir, name);
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content));
  return p;
}

describe('bench config file', () => {
  it('merges profile, tracker entries and calibration offsets into tracker options; paths are relative to the file', async () => {
    // Radar errors as calibration measured them; the tracker corrects by their negatives.
    file('bay3.json', {
      version: 1, bench: 'bay 3', updatedUtc: '2026-12-02T02:10:00.000Z',
      radar: { rangeOffsetM: 0.03, rangeScale: 1, azimuthOffsetDeg: -0.5 },
      positionerFrame: { rotationDeg: 1, translationM: { x: 0, y: 0 } }, history: [],
    });
    file('profile.json', { tracker: { antenna: 'rotating', intervalS: 0.5, gate: { probability: 0.99 } } });
    const cfg = await loadBenchConfig(
      file('bench.json', {
        serial: { path: '/dev/ttyUSB7', baudRate: 230400, parity: 'even' },
        trackerProfile: 'profile.json',
        tracker: { intervalS: 0.25 },
        calibration: 'bay3.json',
        sessionsDir: 'runs',
        bridge: { port: 9001, allowedOrigins: ['http://localhost:5173'] },
      }),
    );
    const o = await bridgeOptionsFromConfig(cfg);
    expect(o.serial).toEqual({ path: '/dev/ttyUSB7', baudRate: 230400, parity: 'even' });
    expect(o.sessionsDir).toBe(join(dir, 'runs'));
    expect(o.port).toBe(9001);
    expect(o.allowedOrigins).toEqual(['http://localhost:5173']);
    expect(o.trackerOptions).toEqual({
      antenna: 'rotating',
      intervalS: 0.25,
      gate: { probability: 0.99 },
      measurement: { rangeOffsetM: -0.03, azimuthOffsetRad: (0.5 * Math.PI) / 180 },
    });
    expect((o.calibration as { positionerFrame: unknown }).positionerFrame).toEqual({ rotationDeg: 1, translationM: { x: 0, y: 0 } });
  });

  it('refuses unknown keys, wrong types, bad JSON and missing files with E_OPTION / E_PATH naming the problem', async () => {
    const cases: [string, RegExp, string][] = [
      [file('a.json', { serail: { path: 'x' } }), /serail|Unrecognized/i, 'E_OPTION'],
      [file('b.json', { serial: { path: '/dev/x', baudRate: -3 } }), /serial\.baudRate/, 'E_OPTION'],
      [file('c.json', '{ "serial": '), /not valid JSON/, 'E_OPTION'],
      [join(dir, 'missing.json'), /cannot read/, 'E_PATH'],
      [file('d.json', { calibration: { version: 1, radar: {} } }), /calibration \(inline\)/, 'E_OPTION'],
    ];
    for (const [path, message, code] of cases) {
      const err = await loadBenchConfig(path).then(bridgeOptionsFromConfig).catch((e: unknown) => e);
      expect(hasCode(err, code as 'E_OPTION')).toBe(true);
      expect((err as Error).message).toMatch(message);
    }
  });
});
