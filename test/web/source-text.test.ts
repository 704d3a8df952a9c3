import { describe, expect, it } from 'vitest';
import { describeSource, sourceFigures } from '../../web/src/panels/source-text.ts';

const src = (kind: 'serial' | 'replay' | 'none', state: 'live' | 'waiting' | 'disconnected' | 'playing' | 'paused' | 'ended') => ({
  kind, state, name: 'x', badLines: 0, lastBad: null, detectionsPerSecond: 0, latencyMs: null, recording: null, recordingError: null,
});

describe('describeSource', () => {
  it('names each state in words with a symbol', () => {
    expect(describeSource('closed', null).state).toBe('disconnected');
    expect(describeSource('connecting', null).state).toBe('connecting');
    expect(describeSource('open', src('serial', 'live'))).toMatchObject({ state: 'live', text: 'Live serial' });
    expect(describeSource('open', src('serial', 'waiting')).state).toBe('waiting');
    expect(describeSource('open', src('serial', 'disconnected')).tone).toBe('bad');
    expect(describeSource('open', src('replay', 'playing')).state).toBe('replay-playing');
    expect(describeSource('open', src('replay', 'paused')).state).toBe('replay-paused');
    expect(describeSource('open', src('replay', 'ended')).state).toBe('replay-ended');
    expect(describeSource('open', src('none', 'waiting')).state).toBe('idle');
    for (const s of ['live', 'waiting', 'disconnected'] as const) expect(describeSource('open', src('serial', s)).symbol).not.toBe('');
  });
});

describe('sourceFigures', () => {
  const replay = (speed: number) => ({ sessionId: 's', durationS: 30, positionS: 3, speed, playing: true, loop: false });
  it('gives a replay the detections per second of run time, not of wall clock, and no latency', () => {
    const f = sourceFigures({ ...src('replay', 'playing'), detectionsPerSecond: 130, latencyMs: 14 }, replay(5));
    expect(f).toMatchObject({ rateLabel: 'Detections (run time)', rate: '26 det/s', latency: 'n/a (replay)' });
    expect(sourceFigures({ ...src('replay', 'paused'), detectionsPerSecond: 3 }, replay(5)).rate).toBe('—');
  });
  it('keeps wall-clock rate and median latency for a live source', () => {
    const f = sourceFigures({ ...src('serial', 'live'), detectionsPerSecond: 26, latencyMs: 4.2 }, null);
    expect(f).toEqual({ rateLabel: 'Detections', rate: '26 det/s', latencyLabel: 'Latency (median)', latency: '4.2 ms' });
  });
});
