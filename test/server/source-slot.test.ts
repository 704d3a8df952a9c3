import { describe, expect, it } from 'vitest';
import { SourceSlot, type SourceHandlers } from '../../bridge/server/source-slot.ts';
import { ScriptedSource, trackAt } from '../helpers/scripted-source.ts';

function recorder(): { handlers: SourceHandlers; seen: string[] } {
  const seen: string[] = [];
  return {
    seen,
    handlers: {
      record: (r) => seen.push(`record ${r.kind}`),
      bad: (b) => seen.push(`bad ${b.line}`),
      state: (s, detail) => seen.push(`state ${s}${detail ? ` ${detail}` : ''}`),
      seeked: (t) => seen.push(`seeked ${t}`),
      error: (e) => seen.push(`error ${e.message}`),
    },
  };
}

describe('SourceSlot', () => {
  it('routes every event of the attached source to its handler', () => {
    const slot = new SourceSlot(() => undefined);
    const src = new ScriptedSource();
    const { handlers, seen } = recorder();
    slot.attach(src, handlers);
    expect(slot.current).toBe(src);
    src.emitRecord({ kind: 'track', update: trackAt(1, 0, 0, 0) });
    src.emitBad({ line: 7, reason: 'checksum', text: 'x' });
    src.setState('ended', 'end of run');
    src.seek(4);
    src.emit('error', new Error('port gone'));
    expect(seen).toEqual(['record track', 'bad 7', 'state ended end of run', 'seeked 4', 'error port gone']);
  });

  it('detaching removes its listeners, closes it and survives a late error; a failed close is logged', async () => {
    const logged: string[] = [];
    const slot = new SourceSlot((line) => logged.push(line));
    const src = new ScriptedSource({ name: 'old' });
    src.close = async () => {
      throw new Error('busy');
    };
    const { handlers, seen } = recorder();
    slot.attach(src, handlers);
    await slot.detach();
    expect(slot.current).toBeNull();
    src.emitRecord({ kind: 'track', update: trackAt(1, 0, 0, 0) });
    expect(() => src.emit('error', new Error('late'))).not.toThrow();
    expect(seen).toEqual([]);
    expect(src.listenerCount('record')).toBe(0);
    expect(logged).toEqual(['closing old: busy']);
    await slot.detach();
  });

  it('runs switches one after the other, and a failed one does not stop the next', async () => {
    const slot = new SourceSlot(() => undefined);
    const order: string[] = [];
    let releaseFirst!: () => void;
    const first = slot.serialise(async () => {
      order.push('first starts');
      await new Promise<void>((r) => (releaseFirst = r));
      order.push('first ends');
      throw new Error('refused');
    });
    const second = slot.serialise(async () => {
      order.push('second');
    });
    await new Promise((r) => setImmediate(r));
    expect(order).toEqual(['first starts']);
    releaseFirst();
    await expect(first).rejects.toThrow('refused');
    await second;
    expect(order).toEqual(['first starts', 'first ends', 'second']);
  });
});
