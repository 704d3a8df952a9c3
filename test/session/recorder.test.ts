import { afterAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Recorder, defaultSessionFileName, resolveRecorderOptions, startRecording } from '../../bridge/session/recorder.ts';
import { SESSION_FORMAT, SESSION_VERSION, sessionHeader } from '../../bridge/session/format.ts';
import { EchotrailError, hasCode } from '../../bridge/errors.ts';

const root = mkdtempSync(join(tmpdir(), 'echotrail-rec-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const det = (t: number) => ({ kind: 'detection' as const, detection: { timeS: t, azimuthRad: 1, rangeM: 2, amplitude: 3 } });

describe('Recorder', () => {
  it('defaults the sessions folder to sessions/', () => {
    expect(resolveRecorderOptions().dir).toBe('sessions');
  });

  it('writes a self-describing header and each record as soon as it arrives', () => {
    const dir = join(root, 'a');
    const start = new Date('2026-12-02T01:02:03.456Z');
    const rec = new Recorder({ dir, name: 'bench run 1', source: { kind: 'serial', name: '/dev/ttyUSB0' }, config: { tracker: 'cv' }, startUtc: start });
    expect(rec.open()).toBe(true);
    const path = rec.status().path!;
    expect(path.endsWith('20261202-010203-bench_run_1.session.jsonl')).toBe(true);
    const header = sessionHeader.parse(JSON.parse(readFileSync(path, 'utf8').split('\n')[0]));
    expect(header.format).toBe(SESSION_FORMAT);
    expect(header.version).toBe(SESSION_VERSION);
    expect(header.startUtc).toBe('2026-12-02T01:02:03.456Z');
    expect(header.source).toEqual({ kind: 'serial', name: '/dev/ttyUSB0' });
    expect(header.config).toEqual({ tracker: 'cv' });
    expect(Object.keys(header.units).length).toBeGreaterThan(3);
    expect(Object.keys(header.records)).toContain('trk');
    rec.record(det(0.5));
    // Nothing buffered: the line is in the file before close().
    const lines = readFileSync(path, 'utf8').split('\n');
    expect(JSON.parse(lines[1])).toMatchObject({ k: 'det', timeS: 0.5, rangeM: 2 });
    rec.record({ kind: 'fixed-echoes', echoes: [] });
    rec.note('operator: reflector moved');
    rec.closeSync();
    const all = readFileSync(path, 'utf8').trimEnd().split('\n').map((l) => JSON.parse(l));
    // Kinds without their own time take the run time reached so far.
    expect(all[2]).toMatchObject({ k: 'fix', timeS: 0.5 });
    expect(all[3]).toMatchObject({ k: 'note', text: 'operator: reflector moved' });
    expect(all[4]).toMatchObject({ k: 'end', timeS: 0.5, summary: { detections: 1, tracks: 0, hasCommanded: false, lines: 5 } });
  });

  it('never overwrites a run that started in the same second', () => {
    const dir = join(root, 'b');
    const start = new Date('2026-12-02T05:00:00Z');
    const r1 = startRecording({ dir, name: 'x', startUtc: start });
    const r2 = startRecording({ dir, name: 'x', startUtc: start });
    expect(r1.name).toBe(defaultSessionFileName(start, 'x'));
    expect(r2.name).toBe(r1.name.replace('.session.jsonl', '-2.session.jsonl'));
    r1.closeSync();
    r2.closeSync();
    expect(readdirSync(dir).length).toBe(2);
  });

  it('an unusable folder gives a clear E_RECORDING error and no throw', () => {
    const blocker = join(root, 'not-a-folder');
    writeFileSync(blocker, 'x');
    const rec = new Recorder({ dir: join(blocker, 'sessions') });
    const errors: unknown[] = [];
    rec.on('error', (e) => errors.push(e));
    expect(rec.open()).toBe(false);
    expect(rec.status().error).toMatch(/not-a-folder/);
    expect(errors.length).toBe(1);
    expect(hasCode(errors[0], 'E_RECORDING')).toBe(true);
    // Later records are counted as dropped, not thrown.
    rec.record(det(1));
    expect(rec.status().dropped).toBe(1);
    expect(() => startRecording({ dir: join(blocker, 'sessions') })).toThrow(EchotrailError);
  });

  it('without an error listener a failure still does not throw', () => {
    const rec = new Recorder({ dir: join(root, 'not-a-folder', 'deeper') });
    expect(() => rec.open()).not.toThrow();
    expect(rec.status().error).not.toBeNull();
  });

  // A real full disk: a 64 KiB tmpfs. Mounting needs privileges; without them this case is skipped.
  const tiny = join(root, 'tiny');
  mkdirSync(tiny);
  let mounted = false;
  try {
    execFileSync('mount', ['-t', 'tmpfs', '-o', 'size=64k', 'tmpfs', tiny], { stdio: 'ignore' });
    mounted = true;
  } catch {
    console.warn('skipping the disk-full case: cannot mount a small tmpfs here (needs root)');
  }
  afterAll(() => {
    if (mounted) execFileSync('umount', [tiny]);
  });

  it.skipIf(!mounted)('disk full stops recording with E_RECORDING and keeps running', () => {
    const rec = new Recorder({ dir: tiny, name: 'full' });
    const errors: EchotrailError[] = [];
    rec.on('error', (e: EchotrailError) => errors.push(e));
    expect(rec.open()).toBe(true);
    for (let i = 0; i < 5000 && !rec.status().error; i++) rec.record(det(i * 0.01));
    expect(rec.status().error).toMatch(/disk full/);
    expect(errors[0]?.code).toBe('E_RECORDING');
    expect(rec.status().recording).toBeNull();
    expect(() => rec.record(det(99))).not.toThrow();
  });
});
