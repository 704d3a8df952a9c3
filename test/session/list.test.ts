import { afterAll, describe, expect, it } from 'vitest';
import { appendFileSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { findSession, listSessions, SCAN_YIELD_LINES } from '../../bridge/session/list.ts';
import { Recorder } from '../../bridge/session/recorder.ts';
import { openSession } from '../../bridge/session/reader.ts';
import { sessionInfo as sessionInfoSchema } from '../../bridge/server/protocol.ts';

const root = mkdtempSync(join(tmpdir(), 'echotrail-list-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function run(dir: string, name: string, start: string, seconds: number, close: boolean): string {
  const r = new Recorder({ dir, name, startUtc: new Date(start) });
  r.open();
  if (name.includes('cmd')) r.record({ kind: 'commanded', path: [{ timeS: 0, x: 0, y: 1 }] });
  // A live run's positioner samples carry the command too.
  if (name.includes('pos')) r.record({ kind: 'positioner', sample: { timeS: 0, cmdX: 0, cmdY: 1, measX: 0.01, measY: 1 } });
  for (let i = 0; i <= seconds * 10; i++) {
    const t = i / 10;
    r.record({ kind: 'detection', detection: { timeS: t, azimuthRad: 1, rangeM: 2, amplitude: 3 } });
    r.record({ kind: 'track', update: { timeS: t, id: 1 + (i % 3), status: 'confirmed', x: 0, y: 1, vx: 0, vy: 0, speed: 0, headingRad: 0, pxx: 1, pxy: 0, pyy: 1, quality: 1, moving: false, hits: 1, misses: 0 } });
  }
  if (close) r.closeSync();
  return r.status().path!;
}

describe('listSessions', () => {
  const a = join(root, 'a');
  const b = join(root, 'b');
  mkdirSync(a);
  mkdirSync(b);
  const clean = run(a, 'clean-cmd', '2026-12-02T01:00:00Z', 4, true);
  const killed = run(b, 'killed', '2026-12-02T02:00:00Z', 2.5, false);
  appendFileSync(killed, '{"k":"det","timeS":2.6,"azimuthRad":1,'); // cut mid-line
  writeFileSync(join(a, 'notes.txt'), 'not a session');
  writeFileSync(join(a, 'junk.session.jsonl'), 'garbage\n');

  it('lists both folders, newest first, with counts from the summary or from a scan', async () => {
    const list = await listSessions([a, b, join(root, 'missing')]);
    for (const info of list) sessionInfoSchema.parse(info);
    expect(list.map((s) => s.name)).toEqual(['killed', 'clean-cmd']);
    expect(list[1]).toMatchObject({ startUtc: '2026-12-02T01:00:00.000Z', durationS: 4, detections: 41, tracks: 3, hasCommanded: true, closed: true });
    // The killed run has no summary line: its figures come from reading it, up to the last full line.
    expect(readFileSync(killed, 'utf8')).not.toContain('"k":"end"');
    expect(list[0]).toMatchObject({ durationS: 2.5, detections: 26, tracks: 3, hasCommanded: false, closed: false });
  });

  it('a clean session read by scanning agrees with its summary', async () => {
    const text = readFileSync(clean, 'utf8').trimEnd().split('\n');
    const scanned = join(b, '20261202-010000-copy.session.jsonl');
    writeFileSync(scanned, text.slice(0, -1).join('\n') + '\n'); // drop the end line
    const list = await listSessions(b);
    const copy = list.find((s) => s.id === '20261202-010000-copy')!;
    const original = (await listSessions(a))[0];
    expect(copy.closed).toBe(false);
    expect({ ...copy, id: original.id, closed: true }).toEqual(original);
  });

  it('counts positioner commands as a commanded path, closed or cut off', async () => {
    const c = join(root, 'c');
    mkdirSync(c);
    run(c, 'live-pos', '2026-12-02T03:00:00Z', 1, true);
    run(c, 'live-pos-killed', '2026-12-02T04:00:00Z', 1, false);
    const list = await listSessions(c);
    expect(list.map((x) => [x.name, x.hasCommanded, x.closed])).toEqual([['live-pos-killed', true, false], ['live-pos', true, true]]);
  });

  it('follows a session that is still being recorded, reading on from where it stopped', async () => {
    const c = join(root, 'c');
    const r = new Recorder({ dir: c, name: 'growing', startUtc: new Date('2026-12-02T04:00:00Z') });
    r.open();
    const det = (t: number) => ({ kind: 'detection' as const, detection: { timeS: t, azimuthRad: 1, rangeM: 2, amplitude: 3 } });
    for (let i = 0; i < 10; i++) r.record(det(i * 0.1));
    expect((await listSessions(c))[0]).toMatchObject({ detections: 10, tracks: 0 });
    for (let i = 10; i < 25; i++) r.record(det(i * 0.1));
    r.record({ kind: 'track', update: { timeS: 2.5, id: 9, status: 'tentative', x: 0, y: 1, vx: 0, vy: 0, speed: 0, headingRad: 0, pxx: 1, pxy: 0, pyy: 1, quality: 0.1, moving: false, hits: 1, misses: 0 } });
    const grown = (await listSessions(c))[0];
    const full = await openSession(join(c, grown.id + '.session.jsonl'));
    expect(grown).toMatchObject({ detections: full.detections, tracks: full.trackIds.size, durationS: full.durationS });
    expect(grown.detections).toBe(25);
    full.close();
    r.closeSync();
    expect((await listSessions(c))[0]).toMatchObject({ detections: 25, tracks: 1, durationS: 2.5 });
  });

  it('finds a session by id and refuses ids that try to leave the folders', async () => {
    const id = (await listSessions(a))[0].id;
    expect(await findSession([b, a], id)).toBe(clean);
    expect(await findSession([a], '../b/x')).toBeNull();
    expect(await findSession([a], '..')).toBeNull();
    expect(await findSession([a], 'nope')).toBeNull();
  });
});

describe('listSessions on a long session without summary', () => {
  it('yields to the event loop while scanning, and caches the result by size and mtime', async () => {
    const d = join(root, 'long');
    const n = 6 * SCAN_YIELD_LINES;
    const r = new Recorder({ dir: d, name: 'long-killed', startUtc: new Date('2026-12-02T05:00:00Z') });
    r.open();
    for (let i = 0; i < n; i++) r.record({ kind: 'detection', detection: { timeS: i / 100, azimuthRad: 1, rangeM: 2, amplitude: 3 } });
    // No closeSync: like kill -9, there is no end line. A whole-second mtime, so that it can be put back exactly below.
    const file = join(d, readdirSync(d)[0]);
    const mtime = new Date('2026-12-02T05:10:00Z');
    utimesSync(file, mtime, mtime);
    let turns = 0;
    let ticking = true;
    const tick = (): void => {
      turns++;
      if (ticking) setImmediate(tick);
    };
    setImmediate(tick);
    const [first, again] = await Promise.all([listSessions(d), listSessions(d)]);
    const during = turns;
    ticking = false;
    expect(first[0]).toMatchObject({ name: 'long-killed', detections: n });
    expect(again).toEqual(first);
    // A synchronous scan lets the loop turn only around the stat/readdir calls, not once per chunk.
    expect(during).toBeGreaterThanOrEqual(5);
    // Unchanged size and mtime: served from the cache, the file is not read again. Proved by
    // overwriting it with same-sized junk and putting its mtime back: a re-scan would see no records.
    writeFileSync(file, 'x'.repeat(statSync(file).size));
    utimesSync(file, mtime, mtime);
    expect(await listSessions(d)).toEqual(first);
    ticking = false;
  });
});
