import { describe, expect, it } from 'vitest';
import { sessionsTable } from '../../bridge/cli/sessions.ts';

describe('echotrail sessions table', () => {
  it('aligns one row per session with readable durations', () => {
    const text = sessionsTable([
      { id: '20261202-093000-circle', name: 'circle', startUtc: '2026-12-02T09:30:00.000Z', durationS: 3725, detections: 120000, tracks: 3, hasCommanded: true },
      { id: 'short', name: 'short', startUtc: '2026-12-02T10:00:00Z', durationS: 42.25, detections: 7, tracks: 0, hasCommanded: false },
    ]);
    const lines = text.split('\n');
    expect(lines).toHaveLength(3);
    expect(lines[0]).toMatch(/^id\s+start \(UTC\)\s+duration\s+detections\s+tracks\s+commanded$/);
    expect(lines[1]).toMatch(/^20261202-093000-circle\s+2026-12-02 09:30:00\s+1h02m\s+120000\s+3\s+yes$/);
    expect(lines[2]).toMatch(/^short\s+2026-12-02 10:00:00\s+42\.3s\s+7\s+0\s+no$/);
    // Right-aligned numbers end in the same column.
    expect(lines[1].indexOf('120000') + 6).toBe(lines[2].indexOf(' 7 ') + 2);
  });
});
