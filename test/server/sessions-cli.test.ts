import { afterAll, describe, expect, it, vi } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { duration, run, sessionsTable } from '../../bridge/cli/sessions.ts';
import { Recorder } from '../../bridge/session/recorder.ts';

describe('echotrail sessions table', () => {
  it('aligns one row per session with readable durations', () => {
    const text = sessionsTable([
      { id: '20261202-093000-circle', name: 'circle', startUtc: '2026-12-02T09:30:00.000Z', durationS: 3725, detections: 120000, tracks: 3, hasCommanded: true },
      { id: 'short', name: 'short', startUtc: '2026-12-02T10:00:00Z', durationS: 42.25, detections: 7, tracks: 0, hasCommanded: false, closed: false },
    ]);
    const lines = text.split('\n');
    expect(lines).toHaveLength(3);
    expect(lines[0]).toMatch(/^id\s+start \(UTC\)\s+duration\s+detections\s+tracks\s+commanded\s+closed$/);
    expect(lines[1]).toMatch(/^20261202-093000-circle\s+2026-12-02 09:30:00\s+1 h 02 min\s+120000\s+3\s+yes\s+yes$/);
    // A recording cut off before its summary says so.
    expect(lines[2]).toMatch(/^short\s+2026-12-02 10:00:00\s+42\.3 s\s+7\s+0\s+no\s+no \(cut off\)$/);
    // Right-aligned numbers end in the same column.
    expect(lines[1].indexOf('120000') + 6).toBe(lines[2].indexOf(' 7 ') + 2);
    // With the files known, a last column gives each one's path as --replay / --session take it.
    const withFiles = sessionsTable([{ id: 'short', name: 'short', startUtc: '2026-12-02T10:00:00Z', durationS: 42.25, detections: 7, tracks: 0, hasCommanded: false }], new Map([['short', 'sessions/short.session.jsonl']]));
    expect(withFiles.split('\n')[0]).toMatch(/\s+file$/);
    expect(withFiles.split('\n')[1]).toMatch(/\s+sessions\/short\.session\.jsonl$/);
  });

  it('says durations as the dashboard does, rounding before it splits', () => {
    expect(duration(42.25)).toBe('42.3 s');
    expect(duration(119.6)).toBe('2 min 00 s');
    expect(duration(80)).toBe('1 min 20 s');
    expect(duration(3725)).toBe('1 h 02 min');
  });
});

describe('echotrail sessions folders', () => {
  const root = mkdtempSync(join(tmpdir(), 'echotrail-sessions-cli-'));
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  function record(dir: string, name: string): void {
    const r = new Recorder({ dir, name, startUtc: new Date('2026-12-02T09:00:00Z') });
    r.open();
    r.record({ kind: 'detection', detection: { timeS: 0.5, azimuthRad: 1, rangeM: 2, amplitude: 3 } });
    r.closeSync();
  }

  /** Runs the command in-process; returns its exit code and the names it listed. */
  async function list(argv: string[]): Promise<{ code: number; names: string[] }> {
    let out = '';
    const spy = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => ((out += String(s)), true));
    try {
      const code = await run([...argv, '--json']);
      return { code, names: code === 0 ? (JSON.parse(out) as { name: string }[]).map((x) => x.name).sort() : [] };
    } finally {
      spy.mockRestore();
    }
  }

  const a = join(root, 'a');
  const b = join(root, 'b');
  record(a, 'first');
  record(b, 'second');

  it('takes --sessions DIR as `start --sessions` does, and still --dir', async () => {
    expect(await list(['--sessions', a])).toEqual({ code: 0, names: ['first'] });
    expect(await list(['--dir', b])).toEqual({ code: 0, names: ['second'] });
    expect(await list(['--sessions', a, '--dir', b])).toEqual({ code: 0, names: ['first', 'second'] });
  });

  it('refuses an unknown option with the usage exit code, as every command does', async () => {
    const err = vi.spyOn(process.stderr, 'write').mockImplementation(() => true);
    try {
      expect((await list(['--session', a])).code).toBe(2);
    } finally {
      err.mockRestore();
    }
  });
});
