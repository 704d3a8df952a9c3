import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appendFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ReplaySource, resolveReplaySourceOptions } from '../../bridge/ingest/replay-source.ts';
import { ManualClock } from '../../bridge/ingest/replay-clock.ts';
import type { BadLine, SourceRecord, SourceState } from '../../bridge/ingest/source.ts';
import { recordTime } from '../../bridge/session/record-time.ts';
import { openSession } from '../../bridge/session/reader.ts';
import { writeSyntheticSession, type SyntheticSession } from '../session/synthetic-session.ts';

let dir: string;
let syn: SyntheticSession;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'echotrail-replay-'));
  syn = writeSyntheticSession(dir, 60, 'replay');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The run time of a replayed record (commanded paths and fixed echoes carry none: null). */
const timeOf = (r: SourceRecord) => recordTime(r);

function harness(path: string, opts: Partial<ConstructorParameters<typeof ReplaySource>[0]> = {}) {
  const clock = new ManualClock();
  const src = new ReplaySource({ path, clock, ...opts });
  const log: { ev: string; rec?: SourceRecord; t?: number; state?: SourceState }[] = [];
  src.on('record', (rec: SourceRecord) => log.push({ ev: 'record', rec }));
  src.on('seeked', (t: number) => log.push({ ev: 'seeked', t }));
  src.on('state', (state: SourceState) => log.push({ ev: 'state', state }));
  const bad: BadLine[] = [];
  src.on('bad', (b: BadLine) => bad.push(b));
  const records = () => log.filter((l) => l.ev === 'record').map((l) => l.rec!);
  return { clock, src, log, bad, records };
}

/** A replay of `path` played at 50× until it ended (the harness's clock moved on 2 s). */
async function playedToTheEnd(path: string): Promise<ReturnType<typeof harness>> {
  const h = harness(path, { speed: 50 });
  await h.src.start();
  h.clock.advance(2000);
  expect(h.log.at(-1)).toEqual({ ev: 'state', state: 'ended' });
  return h;
}

/** The state the source last announced. */
function lastState(h: ReturnType<typeof harness>): SourceState | undefined {
  return h.log.filter((l) => l.ev === 'state').at(-1)?.state;
}

describe('ReplaySource over a session', () => {
  it('releases the recorded records in order, in real time', async () => {
    const h = harness(syn.path);
    await h.src.start();
    expect(h.src.carriesTracks).toBe(true);
    h.clock.advance(2000);
    const pos = h.src.state().positionS;
    expect(pos).toBeCloseTo(2, 9);
    const got = h.records();
    // A prefix of the file, nothing ahead of the clock, and nothing due left behind
    // (the last tick may lag the clock by at most maxTickMs).
    expect(got).toEqual(syn.written.slice(0, got.length).map((w) => w.record));
    expect(got.every((r) => (timeOf(r) ?? 0) <= pos)).toBe(true);
    const due = syn.written.filter((w) => w.timeS <= pos - 0.1).length;
    expect(got.length).toBeGreaterThanOrEqual(due);
    await h.src.close();
  });

  it('plays faster with setSpeed and clamps the factor to 0.1–50', async () => {
    const h = harness(syn.path);
    await h.src.start();
    h.src.setSpeed(10);
    h.clock.advance(1000);
    expect(h.src.state().positionS).toBeCloseTo(10, 9);
    h.src.setSpeed(500);
    expect(h.src.state().speed).toBe(50);
    h.src.setSpeed(0);
    expect(h.src.state().speed).toBe(0.1);
    expect(() => resolveReplaySourceOptions({ path: syn.path, speed: 100 })).toThrow(/0.1–50/);
    await h.src.close();
  });

  it('pause freezes the position and the output; play resumes where it stopped', async () => {
    const h = harness(syn.path);
    await h.src.start();
    h.clock.advance(1500);
    h.src.pause();
    const n = h.records().length;
    const at = h.src.state().positionS;
    h.clock.advance(10_000);
    expect(h.records().length).toBe(n);
    expect(h.src.state()).toMatchObject({ positionS: at, playing: false });
    h.src.play();
    h.clock.advance(1000);
    expect(h.src.state().positionS).toBeCloseTo(at + 1, 9);
    expect(h.records().length).toBeGreaterThan(n);
    await h.src.close();
  });

  it('step advances by the given run time and pauses', async () => {
    const h = harness(syn.path, { autoplay: false });
    await h.src.start();
    h.src.step(0.5);
    expect(h.src.state()).toMatchObject({ positionS: 0.5, playing: false });
    expect(h.records()).toEqual(syn.written.filter((w) => w.timeS <= 0.5).map((w) => w.record));
    // Default step: one antenna revolution as recorded. The synthetic antenna turns 0.3 rad per
    // 0.1 s scan, so 2π/3 s, seen to within one scan.
    h.src.step();
    const rev = h.src.state().positionS - 0.5;
    expect(Math.abs(rev - (2 * Math.PI) / 3)).toBeLessThanOrEqual(0.1 + 1e-9);
    expect(h.records().length).toBe(syn.written.filter((w) => w.timeS <= 0.5 + rev).length);
    h.src.step(0.25);
    expect(h.src.state().positionS).toBeCloseTo(0.75 + rev, 12);
    await h.src.close();
  });

  it('step back goes exactly one revolution earlier, paused, with the state there re-sent', async () => {
    const reader = await openSession(syn.path);
    const rev = reader.revolutionS!;
    expect(rev).toBeGreaterThan(0);
    const h = harness(syn.path, { autoplay: false });
    await h.src.start();
    h.src.step();
    h.src.step();
    expect(h.src.state().positionS).toBe(2 * rev);
    h.src.stepBack();
    expect(h.src.state()).toMatchObject({ positionS: 2 * rev - rev, playing: false });
    const i = h.log.findIndex((l) => l.ev === 'seeked');
    expect(h.log[i].t).toBe(rev);
    // A seek underneath: the re-sent records rebuild the run as the reader has it there.
    expect(h.src.snapshot()).toEqual(reader.snapshotAt(rev));
    const tracks = new Map<number, unknown>();
    for (const r of h.log.slice(i + 1).map((l) => l.rec!)) {
      if (r.kind === 'track') tracks.set(r.update.id, r.update);
      if (r.kind === 'deletion') tracks.delete(r.deletion.id);
    }
    expect([...tracks.values()].sort((a: any, b: any) => a.id - b.id)).toEqual(reader.snapshotAt(rev).tracks);
    reader.close();

    // While playing: from the clock's position, and paused there; a given length is honoured.
    h.src.play();
    h.clock.advance(3000);
    h.src.stepBack();
    expect(h.log.filter((l) => l.ev === 'state').at(-1)).toEqual({ ev: 'state', state: 'paused' });
    expect(h.src.state().playing).toBe(false);
    expect(h.src.state().positionS).toBeCloseTo(3, 12);
    h.clock.advance(5000);
    expect(h.src.state().positionS).toBeCloseTo(3, 12);
    h.src.stepBack(0.25);
    expect(h.src.state().positionS).toBeCloseTo(2.75, 12);
    await h.src.close();
  });

  it('step back stops at 0 and stays there, and from the end it leaves the replay paused', async () => {
    const h = harness(syn.path, { autoplay: false });
    await h.src.start();
    h.src.step(0.1);
    h.src.stepBack();
    expect(h.src.state()).toMatchObject({ positionS: 0, playing: false });
    const seeks = h.log.filter((l) => l.ev === 'seeked').length;
    expect(seeks).toBe(1);
    h.src.stepBack();
    expect(h.src.state()).toMatchObject({ positionS: 0, playing: false });
    expect(h.log.filter((l) => l.ev === 'seeked').length).toBe(seeks);
    await h.src.close();

    const e = await playedToTheEnd(syn.path);
    e.src.stepBack(1);
    expect(lastState(e)).toBe('paused');
    expect(e.src.state()).toMatchObject({ positionS: 59, playing: false });
    // No longer ended: a step forward goes on from there instead of doing nothing.
    e.src.step(0.5);
    expect(e.src.state().positionS).toBe(59.5);
    await e.src.close();
  });

  it("seek emits 'seeked', re-sends the state there, then continues after it", async () => {
    const h = harness(syn.path);
    await h.src.start();
    h.clock.advance(500);
    h.src.seek(37.25);
    const i = h.log.findIndex((l) => l.ev === 'seeked');
    expect(h.log[i].t).toBe(37.25);
    expect(h.src.state()).toMatchObject({ positionS: 37.25, playing: true });
    // The re-sent records rebuild exactly the snapshot the reader gives for that time.
    const reader = await openSession(syn.path);
    const want = reader.snapshotAt(37.25);
    expect(h.src.snapshot()).toEqual(want);
    const resent = h.log.slice(i + 1).map((l) => l.rec!);
    const tracks = new Map<number, unknown>();
    for (const r of resent) {
      if (r.kind === 'track') tracks.set(r.update.id, r.update);
      if (r.kind === 'deletion') tracks.delete(r.deletion.id);
    }
    expect([...tracks.values()].sort((a: any, b: any) => a.id - b.id)).toEqual(want.tracks);
    expect(resent.filter((r) => r.kind === 'detection').length).toBe(want.detections.length);
    expect(resent.some((r) => r.kind === 'commanded')).toBe(true);
    reader.close();
    const before = h.log.length;
    h.clock.advance(1000);
    const after = h.log.slice(before).map((l) => l.rec!);
    expect(after.length).toBeGreaterThan(0);
    expect(after.every((r) => (timeOf(r) ?? 37.3) > 37.25)).toBe(true);
    h.src.seek(-5);
    expect(h.src.state().positionS).toBe(0);
    h.src.seek(1e9);
    expect(h.src.state().positionS).toBe(h.src.state().durationS);
    await h.src.close();
  });

  it('ends at the end, and play() after the end starts again from 0', async () => {
    const h = harness(syn.path, { speed: 50 });
    await h.src.start();
    h.clock.advance(2000);
    expect(h.log.at(-1)).toEqual({ ev: 'state', state: 'ended' });
    expect(h.records().length).toBe(syn.written.length);
    expect(h.src.state()).toMatchObject({ playing: false, positionS: 60 });
    h.src.play();
    expect(h.log.filter((l) => l.ev === 'seeked').map((l) => l.t)).toEqual([0]);
    expect(h.src.state().playing).toBe(true);
    await h.src.close();
  });

  it('a seek back from the end leaves the replay paused there, no longer ended', async () => {
    const h = await playedToTheEnd(syn.path);
    h.src.seek(20);
    expect(lastState(h)).toBe('paused');
    expect(h.src.state()).toMatchObject({ playing: false, positionS: 20 });
    await h.src.close();
  });

  it('loops: at the end it seeks to 0 and keeps playing', async () => {
    const h = harness(syn.path, { speed: 50, loop: true });
    await h.src.start();
    // 60 s at 50× take 1.2 s: 1.5 s of clock is one restart, 3 s two.
    h.clock.advance(1500);
    expect(h.log.filter((l) => l.ev === 'seeked').map((l) => l.t)).toEqual([0]);
    h.clock.advance(1500);
    expect(h.log.filter((l) => l.ev === 'seeked').map((l) => l.t)).toEqual([0, 0]);
    expect(h.log.some((l) => l.state === 'ended')).toBe(false);
    expect(h.src.state().playing).toBe(true);
    expect(h.src.state().positionS).toBeGreaterThan(0);
    await h.src.close();
  });

  it('reports the bad lines of a damaged session and plays the good ones', async () => {
    const path = join(dir, 'damaged.session.jsonl');
    const { readFileSync } = await import('node:fs');
    const lines = readFileSync(syn.path, 'utf8').split('\n').slice(0, 40);
    lines[10] = '{"k":"det","timeS":"soon"}';
    writeFileSync(path, lines.join('\n') + '\n');
    appendFileSync(path, '{"k":"ant"');
    const h = harness(path, { speed: 50 });
    await h.src.start();
    expect(h.bad.map((b) => b.line)).toEqual([11]);
    h.clock.advance(1000);
    expect(h.records().length).toBe(40 - 1 - 1);
    await h.src.close();
  });
});

describe('ReplaySource over a detections CSV', () => {
  it('counts every skipped row of a badly damaged file and ends on the last one', async () => {
    // 60 bad rows: more than the reader lists one by one. The source's count must still be 60 and
    // its last bad line the file's last bad row (the dashboard shows both).
    const path = join(dir, 'damaged.csv');
    const rows = ['time_s,azimuth_deg,range_m,amplitude'];
    for (let i = 0; i < 200; i++) rows.push(i % 3 === 1 && i < 180 ? `${(i * 0.05).toFixed(2)},10,abc,5` : `${(i * 0.05).toFixed(2)},${(i * 3) % 360},2.5,5`);
    writeFileSync(path, rows.join('\n') + '\n');
    const h = harness(path);
    await h.src.start();
    const count = h.bad.reduce((n, b) => n + (b.count ?? 1), 0);
    expect(count).toBe(60);
    const lastBadLine = 1 + 1 + 178; // header is line 1; i = 178 is the last i % 3 === 1 below 180
    expect(h.bad[h.bad.length - 1].line).toBe(lastBadLine);
    expect(h.bad[0].line).toBe(3);
    await h.src.close();
  });

  it('replays detections without tracks and can hand them over for re-tracking', async () => {
    const path = join(dir, 'run.csv');
    const rows = ['amplitude,time_s,range_m,azimuth_deg,extra'];
    for (let i = 0; i < 100; i++) rows.push(`${10 + i},${(i * 0.05).toFixed(2)},${(2 + i * 0.01).toFixed(2)},${(i * 3) % 360},x`);
    rows.splice(20, 0, '5,0.96,abc,10,x');
    rows.splice(30, 0, '-1,1.41,2,10,x'); // amplitude not positive

    writeFileSync(path, rows.join('\n') + '\n');
    const h = harness(path);
    await h.src.start();
    expect(h.src.carriesTracks).toBe(false);
    // One bad line per skipped row, with its own number and reason.
    expect(h.bad.map((b) => b.line)).toEqual([21, 31]);
    expect(h.bad[0].reason).toMatch(/^range_m "abc" is not a number/);
    expect(h.bad[1].reason).toMatch(/amplitude/);
    h.clock.advance(1000);
    const recs = h.records();
    expect(recs.every((r) => r.kind === 'detection')).toBe(true);
    expect(recs.length).toBe(21); // t = 0.00 … 1.00
    const first = recs[0];
    if (first.kind !== 'detection') throw new Error('not a detection');
    expect(first.detection).toMatchObject({ timeS: 0, rangeM: 2, amplitude: 10 });
    const until = [...h.src.recordsUntil(2)];
    expect(until.length).toBe(41);
    h.src.seek(3);
    expect(h.src.snapshot().detections.map((d) => d.timeS)).toEqual([2, 2.05, 2.1, 2.15, 2.2, 2.25, 2.3, 2.35, 2.4, 2.45, 2.5, 2.55, 2.6, 2.65, 2.7, 2.75, 2.8, 2.85, 2.9, 2.95, 3]);
    await h.src.close();
  });
});
