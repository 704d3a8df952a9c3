/**
 * `kill -9` during recording: a child process records as fast as it can; it is killed with
 * SIGKILL; the file must open, hold every record up to the last complete line with none missing,
 * and replay to its end.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { openSession } from '../../bridge/session/reader.ts';
import { listSessions } from '../../bridge/session/list.ts';
import { ReplaySource } from '../../bridge/ingest/replay-source.ts';
import { ManualClock } from '../../bridge/ingest/replay-clock.ts';
import type { SourceRecord } from '../../bridge/ingest/source.ts';

const repo = resolve(import.meta.dirname, '../..');

/** The child: records detections numbered 1, 2, 3... (in `line`) and announces its progress. */
const childSource = (dir: string) => `
import { Recorder } from ${JSON.stringify(pathToFileURL(join(repo, 'bridge/session/recorder.ts')).href)};
const rec = new Recorder({ dir: ${JSON.stringify(dir)}, name: 'killed', source: { kind: 'simulator', name: 'kill-test' } });
if (!rec.open()) { console.error(rec.status().error); process.exit(1); }
let n = 0;
function burst() {
  for (let k = 0; k < 200; k++) {
    n++;
    const t = n * 0.001;
    rec.record({ kind: 'detection', detection: { timeS: t, azimuthRad: (n % 6283) / 1000, rangeM: 2 + (n % 100) / 100, amplitude: 10, line: n } });
    if (n % 10 === 0) rec.record({ kind: 'track', update: { timeS: t, id: 1, status: 'confirmed', x: 1, y: 2, vx: 0, vy: 0, speed: 0, headingRad: 0, pxx: 1, pxy: 0, pyy: 1, quality: 1, moving: true, hits: n, misses: 0 } });
  }
  process.stdout.write('written ' + n + '\\n');
  setImmediate(burst);
}
burst();
`;

describe('kill -9 while recording', () => {
  let dir: string;
  let child: ChildProcess;
  let announced = 0;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'echotrail-kill-'));
    const script = join(dir, 'record-forever.mts');
    writeFileSync(script, childSource(join(dir, 'sessions')));
    child = spawn(process.execPath, ['--import', 'tsx', script], { cwd: repo, stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr!.on('data', (d) => (stderr += d));
    child.stdout!.on('data', (d: Buffer) => {
      const m = /written (\d+)\n(?![\s\S]*written)/.exec(d.toString());
      if (m) announced = Number(m[1]);
    });
    const exited = new Promise<void>((res) => child.once('exit', () => res()));
    // Let it write a good few thousand records; the limit only stops a hung test.
    const end = Date.now() + 60_000;
    while (announced < 20_000) {
      if (child.exitCode !== null || Date.now() > end) throw new Error(`recorder child did not get going: ${stderr}`);
      await new Promise((r) => setTimeout(r, 10));
    }
    const before = announced;
    child.kill('SIGKILL');
    await exited;
    expect(child.signalCode).toBe('SIGKILL');
    announced = before;
  });

  afterAll(() => {
    if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    rmSync(dir, { recursive: true, force: true });
  });

  it('opens, and holds every record up to the last complete line with no gap', async () => {
    const files = readdirSync(join(dir, 'sessions'));
    expect(files.length).toBe(1);
    const path = join(dir, 'sessions', files[0]);
    const bytes = readFileSync(path);
    const completeLines = bytes.toString('utf8').split('\n').length - 1;
    const s = await openSession(path);
    expect(s.badLineCount).toBe(0);
    expect(s.endSummary).toBeNull();
    // Either the kill fell between two writes, or the torn line is reported and ignored.
    if (s.truncatedTail) expect(s.truncatedTail.bytes).toBe(bytes.length - (bytes.lastIndexOf(0x0a) + 1));
    else expect(bytes[bytes.length - 1]).toBe(0x0a);
    const numbers = [...s.records(0)].filter((r) => r.record.kind === 'detection').map((r) => (r.record as { detection: { line: number } }).detection.line);
    expect(numbers.length).toBeGreaterThanOrEqual(announced);
    expect(numbers.every((v, i) => v === i + 1)).toBe(true);
    expect([...s.records(0)].length).toBe(completeLines - 1);
    expect(s.snapshotAt(s.durationS).tracks.map((t) => t.id)).toEqual([1]);
    s.close();
  });

  it('replays to its end and shows in the session list', async () => {
    const path = join(dir, 'sessions', readdirSync(join(dir, 'sessions'))[0]);
    const clock = new ManualClock();
    const src = new ReplaySource({ path, clock, speed: 50 });
    const got: SourceRecord[] = [];
    let ended = false;
    src.on('record', (r: SourceRecord) => got.push(r));
    src.on('state', (st: string) => (ended ||= st === 'ended'));
    await src.start();
    for (let i = 0; i < 10_000 && !ended; i++) clock.advance(100);
    expect(ended).toBe(true);
    const s = await openSession(path);
    expect(got.length).toBe([...s.records(0)].length);
    const list = await listSessions(join(dir, 'sessions'));
    expect(list.length).toBe(1);
    expect(list[0].detections).toBe(s.detections);
    expect(list[0].durationS).toBe(s.durationS);
    expect(statSync(path).size).toBeGreaterThan(0);
    s.close();
    await src.close();
  });
});
