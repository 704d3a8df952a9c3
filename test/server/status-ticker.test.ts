import { afterEach, describe, expect, it, vi } from 'vitest';
import { StatusTicker, type StatusTickerOptions } from '../../bridge/server/status-ticker.ts';
import { LiveState } from '../../bridge/server/state.ts';
import { SourceStats } from '../../bridge/server/source-stats.ts';
import type { ReplayState, ServerMessage } from '../../bridge/server/protocol.ts';
import type { FixedEcho } from '../../bridge/types.ts';

const echo = (x: number, seen: number): FixedEcho => ({ x, y: 1, rangeM: 1, azimuthRad: 0, seen, amplitude: 1 });

function ticker(o: Partial<StatusTickerOptions> = {}): { t: StatusTicker; sent: ServerMessage[]; state: LiveState } {
  const sent: ServerMessage[] = [];
  const state = new LiveState();
  const stats = new SourceStats(() => 0);
  const t = new StatusTicker({
    emit: (m) => sent.push(m),
    status: () => stats.status(),
    replayState: () => null,
    trackerFixedEchoes: () => null,
    comparisonMessages: () => [],
    state,
    ...o,
  });
  return { t, sent, state };
}

afterEach(() => {
  vi.useRealTimers();
});

describe('StatusTicker', () => {
  it('every second: the fixed echoes when they changed, the status line, then the comparison figures', () => {
    vi.useFakeTimers();
    let echoes = [echo(1, 3)];
    const figures = { type: 'comparison', figures: { timeS: 1, samples: 1, rmseM: 0, crossTrackM: null, alongTrackM: null, maxErrorM: null, lagS: null, trackId: 1 } } as const;
    const { t, sent, state } = ticker({ trackerFixedEchoes: () => echoes, comparisonMessages: () => [figures] });
    vi.advanceTimersByTime(1000);
    expect(sent.map((m) => m.type)).toEqual(['fixed-echoes', 'source', 'comparison']);
    expect(state.fixedEchoes).toBe(echoes);
    vi.advanceTimersByTime(1000);
    expect(sent.map((m) => m.type).slice(3)).toEqual(['source', 'comparison']);
    echoes = [echo(1, 4)];
    vi.advanceTimersByTime(1000);
    expect(sent.map((m) => m.type).slice(5)).toEqual(['fixed-echoes', 'source', 'comparison']);
    t.close();
  });

  it('fixed echoes from the source go out once; after forgetFixedEchoes() the same map goes out again', () => {
    const { t, sent } = ticker();
    t.fixedEchoes([echo(2, 1)]);
    t.fixedEchoes([echo(2, 1)]);
    expect(sent.filter((m) => m.type === 'fixed-echoes')).toHaveLength(1);
    t.forgetFixedEchoes();
    t.fixedEchoes([echo(2, 1)]);
    expect(sent.filter((m) => m.type === 'fixed-echoes')).toHaveLength(2);
    t.close();
  });

  it('a flood of bad lines gets one status message per 250 ms', () => {
    vi.useFakeTimers();
    const { t, sent } = ticker();
    for (let i = 0; i < 100; i++) t.scheduleStatus();
    expect(sent).toHaveLength(0);
    vi.advanceTimersByTime(250);
    expect(sent.map((m) => m.type)).toEqual(['source']);
    t.scheduleStatus();
    vi.advanceTimersByTime(250);
    expect(sent).toHaveLength(2);
    t.close();
  });

  it('sends the replay state only when it changed, unless forced; nothing when there is no replay', () => {
    vi.useFakeTimers();
    let replay: ReplayState | null = null;
    const { t, sent } = ticker({ replayState: () => replay });
    vi.advanceTimersByTime(250);
    expect(sent).toHaveLength(0);
    replay = { sessionId: 's', durationS: 10, positionS: 0, speed: 1, playing: true, loop: false };
    vi.advanceTimersByTime(250);
    vi.advanceTimersByTime(250);
    expect(sent.filter((m) => m.type === 'replay')).toHaveLength(1);
    t.tickReplay(true);
    expect(sent.filter((m) => m.type === 'replay')).toHaveLength(2);
    replay = { ...replay, positionS: 0.25 };
    vi.advanceTimersByTime(250);
    expect(sent.filter((m) => m.type === 'replay')).toHaveLength(3);
    t.close();
  });

  it('sends nothing more once closed, a scheduled status included', () => {
    vi.useFakeTimers();
    const { t, sent } = ticker();
    t.scheduleStatus();
    t.close();
    vi.advanceTimersByTime(5000);
    expect(sent).toHaveLength(0);
  });
});
