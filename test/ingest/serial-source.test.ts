// SerialSource's port-error reporting, without a device: the handlers are driven directly, as
// the serialport 'error' event and the open/close paths would.
import { describe, expect, it } from 'vitest';
import { SerialSource } from '../../bridge/ingest/serial-source.ts';
import type { SourceState } from '../../bridge/ingest/source.ts';

interface Internals {
  onPortError(err: Error): void;
  setState(s: SourceState, detail?: string): void;
}

describe('SerialSource port errors', () => {
  it('reports a repeated error once per state and counts the rest', () => {
    const src = new SerialSource({ path: '/dev/echotrail-test-absent' });
    const events: [SourceState, string | undefined][] = [];
    src.on('state', (s: SourceState, detail?: string) => events.push([s, detail]));
    const inner = src as unknown as Internals;
    inner.setState('live', 'opened');
    for (let i = 0; i < 500; i++) inner.onPortError(new Error('EIO: i/o error'));
    expect(events).toEqual([['live', 'opened'], ['live', 'serial error: EIO: i/o error']]);
    // Many distinct messages: a few are shown, the rest counted.
    for (let i = 0; i < 50; i++) inner.onPortError(new Error(`error ${i}`));
    expect(events.length).toBe(4);
    inner.setState('waiting', 'device disconnected');
    expect(events[4]).toEqual(['waiting', 'device disconnected; 547 more serial error(s) not shown']);
    // A new state: the same error is worth one report again.
    inner.onPortError(new Error('EIO: i/o error'));
    expect(events.length).toBe(6);
  });
});
