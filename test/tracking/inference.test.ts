import { describe, expect, it } from 'vitest';
import { decide, describeInference } from '../../bridge/tracking/inference.ts';
import { resolveTrackerOptions } from '../../bridge/tracking/tracker-options.ts';
import type { Detection } from '../../bridge/types.ts';

const rotating = (P: number): Detection[] => {
  const out: Detection[] = [];
  for (let k = 0; k < 8; k++) for (const az of [0.5, 2, 4]) out.push({ timeS: (k + az / (2 * Math.PI)) * P, azimuthRad: az, rangeM: 3, amplitude: 1 });
  return out;
};

describe('warm-up decisions', () => {
  it('infers, or takes what was given, and says which', () => {
    const a = decide(rotating(1.5), resolveTrackerOptions());
    expect(a.antenna).toBe('rotating');
    expect(a.antennaFrom).toBe('inferred');
    expect(a.intervalS).toBeCloseTo(1.5, 6);
    // Rotating: no fixed batch window; detections are assigned as the beam passes their gates.
    expect(a.batchS).toBe(0);
    expect(decide(rotating(1.5), resolveTrackerOptions({ batchS: 0.2 })).batchS).toBe(0.2);
    const b = decide(rotating(1.5), resolveTrackerOptions({ antenna: 'rotating', intervalS: 2, measurement: { sigmaRangeM: 0.1 } }));
    expect(b.intervalFrom).toBe('option');
    expect(b.intervalS).toBe(2);
    expect(b.noiseFrom).toBe('option');
    expect(b.sigmaRangeM).toBe(0.1);
    const lines = describeInference(a);
    expect(lines[0]).toMatch(/^antenna: rotating \(inferred from the run/);
    expect(lines[1]).toMatch(/^revolution period: 1\.500 s \(inferred from the run\); assignment per detection/);
    expect(lines[2]).toMatch(/σ_range 5\.0 cm, σ_azimuth 1\.50° \(default\)/);
  });

  it('falls back to defaults on an empty warm-up', () => {
    const a = decide([], resolveTrackerOptions());
    expect(a.intervalFrom).toBe('default');
    expect(a.intervalS).toBeGreaterThan(0);
  });
});
