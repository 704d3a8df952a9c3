import { describe, expect, it } from 'vitest';
import { CLOCK_RESET_S, LiveRestart, clockWentBack, type LiveRestartOptions } from '../../bridge/server/live-restart.ts';
import type { TrackEngine } from '../../bridge/types.ts';
import { ScriptedSource, trackAt } from '../helpers/scripted-source.ts';

const detection = (timeS: number) => ({ kind: 'detection' as const, detection: { timeS, azimuthRad: 0, rangeM: 5, amplitude: 1 } });
const tracker = { push: () => ({ updates: [], deletions: [] }), flush: () => ({ updates: [], deletions: [] }), tracks: () => [], fixedEchoes: () => [] } satisfies TrackEngine;

/** A restart whose every step is written down, in order. */
function restart(latestS: number, o: Partial<LiveRestartOptions> = {}): { r: LiveRestart; steps: string[] } {
  const steps: string[] = [];
  const r = new LiveRestart({
    latestS: () => latestS,
    flushTracker: () => steps.push('flush tracker'),
    batch: { flush: () => steps.push('flush batch'), discard: () => steps.push('discard batch') },
    forgetRun: () => steps.push('forget run'),
    createTracker: () => tracker,
    useTracker: (t) => steps.push(t === tracker ? 'new tracker' : 'other tracker'),
    recording: { rotate: (s) => steps.push(`rotate ${s.name}`) },
    announce: () => steps.push('announce'),
    log: (line) => steps.push(`log ${line}`),
    ...o,
  });
  return { r, steps };
}

describe('clockWentBack', () => {
  it('is true only for a timed record more than CLOCK_RESET_S before the latest time', () => {
    expect(clockWentBack(detection(100 - CLOCK_RESET_S - 0.01), 100)).toBe(true);
    expect(clockWentBack(detection(100 - CLOCK_RESET_S), 100)).toBe(false);
    expect(clockWentBack(detection(99), 100)).toBe(false);
    expect(clockWentBack({ kind: 'antenna', sample: { timeS: 0, azimuthRad: 0 } }, 100)).toBe(true);
    expect(clockWentBack({ kind: 'positioner', sample: { timeS: 0, cmdX: 0, cmdY: 0 } }, 100)).toBe(true);
    // Records without a time of their own never start a run.
    expect(clockWentBack({ kind: 'track', update: trackAt(1, 0, 0, 0) }, 100)).toBe(false);
    expect(clockWentBack({ kind: 'commanded', path: [] }, 100)).toBe(false);
  });
});

describe('LiveRestart', () => {
  it('does nothing while the clock goes on', () => {
    const { r, steps } = restart(100);
    r.check(detection(100.5), new ScriptedSource({ kind: 'serial', name: '/dev/ttyUSB0' }));
    expect(steps).toEqual([]);
  });

  it('ends the old run before anything resets, then starts the new one and tells clients last', () => {
    const { r, steps } = restart(100);
    r.check(detection(0.2), new ScriptedSource({ kind: 'serial', name: '/dev/ttyUSB0' }));
    expect(steps).toEqual([
      'log source /dev/ttyUSB0: time went back from 100.000 s; starting a new run',
      'flush tracker', 'flush batch', 'discard batch', 'forget run', 'new tracker', 'rotate /dev/ttyUSB0', 'announce',
    ]);
  });

  it('refuses a tracker factory that is not synchronous, before the tracker or the recording change', () => {
    const { r, steps } = restart(100, { createTracker: async () => tracker });
    expect(() => r.check(detection(0), new ScriptedSource({ kind: 'serial' }))).toThrow(/synchronous/);
    expect(steps.slice(1)).toEqual(['flush tracker', 'flush batch', 'discard batch', 'forget run']);
  });
});
