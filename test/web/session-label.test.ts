import { describe, expect, it } from 'vitest';
import { localStart, sessionLabel } from '../../web/src/panels/session-label.ts';

const base = { id: '20261202-205520-live', name: 'live', startUtc: '2026-12-02T20:55:20.000Z', durationS: 62, detections: 900, tracks: 1, hasCommanded: true };

describe('session picker label', () => {
  it('tells two live recordings apart by their start, in the given zone', () => {
    expect(localStart(base.startUtc, 0)).toBe('2026-12-02 20:55');
    expect(localStart(base.startUtc, 60)).toBe('2026-12-02 21:55');
    expect(sessionLabel(base, 0)).not.toBe(sessionLabel({ ...base, startUtc: '2026-12-02T21:10:00Z' }, 0));
  });

  it('says one track, the commanded path, and a recording cut off before its summary', () => {
    const l = sessionLabel({ ...base, closed: false }, 0);
    expect(l).toContain('live · 2026-12-02 20:55');
    expect(l).toContain('1 track,');
    expect(l).toContain('commanded path');
    expect(l).toContain('cut off');
    expect(sessionLabel({ ...base, closed: true, hasCommanded: false, tracks: 2 }, 0)).not.toMatch(/cut off|commanded/);
  });
});
