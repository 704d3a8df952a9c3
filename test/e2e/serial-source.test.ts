/**
 * SerialSource against a real pseudo-terminal pair made by socat: lines written at one end come
 * out as records at the other; killing socat makes the device vanish, restarting it brings it
 * back, and the source recovers by itself.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { closeSync, existsSync, mkdtempSync, openSync, readlinkSync, rmSync, symlinkSync, unlinkSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SerialSource } from '../../bridge/ingest/serial-source.ts';
import { encodeLine } from '../../bridge/ingest/line-protocol.ts';
import type { BadLine, SourceRecord, SourceState } from '../../bridge/ingest/source.ts';

const SOCAT = '/usr/bin/socat';
const haveSocat = existsSync(SOCAT);
if (!haveSocat) {
  if (process.env.CI === 'true') throw new Error(`${SOCAT} is missing: the serial end-to-end test cannot run under CI=true`);
  console.warn(`skipping serial end-to-end tests: ${SOCAT} not found (install socat)`);
}

/** Polls until `pred` holds; the timeout only stops a hung test, it measures nothing. */
async function waitFor(pred: () => boolean, what: string, timeoutMs = 20_000): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!pred()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe.skipIf(!haveSocat)('SerialSource over a socat pty pair', () => {
  let dir: string;
  let a: string;
  let b: string;
  let socat: ChildProcess | null = null;
  let source: SerialSource;
  const records: SourceRecord[] = [];
  const bad: BadLine[] = [];
  const states: SourceState[] = [];

  async function startSocat(): Promise<void> {
    socat = spawn(SOCAT, ['-d', '-d', `pty,raw,echo=0,link=${a}`, `pty,raw,echo=0,link=${b}`], { stdio: 'ignore' });
    await waitFor(() => existsSync(a) && existsSync(b), 'socat links');
  }

  async function killSocat(): Promise<void> {
    const p = socat!;
    socat = null;
    const gone = new Promise((r) => p.once('exit', r));
    p.kill('SIGKILL');
    await gone;
  }

  /** Writes raw bytes into the far end of the pair, as the hardware would. */
  function send(text: string | Buffer): void {
    const fd = openSync(b, 'w');
    try {
      writeSync(fd, typeof text === 'string' ? Buffer.from(text, 'latin1') : text);
    } finally {
      closeSync(fd);
    }
  }

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'echotrail-serial-'));
    a = join(dir, 'a');
    b = join(dir, 'b');
    await startSocat();
    source = new SerialSource({ path: a, baudRate: 115200, reopenInitialMs: 50, reopenMaxMs: 400, presenceCheckMs: 100 });
    source.on('record', (r: SourceRecord) => records.push(r));
    source.on('bad', (x: BadLine) => bad.push(x));
    source.on('state', (s: SourceState) => states.push(s));
    await source.start();
    await waitFor(() => source.state === 'live', 'the port to open');
  });

  afterAll(async () => {
    await source?.close();
    if (socat) await killSocat();
    rmSync(dir, { recursive: true, force: true });
  });

  it('turns written lines into records and refuses bad ones with their line numbers', async () => {
    const det = encodeLine({ kind: 'detection', detection: { timeS: 1.25, azimuthRad: 0.75, rangeM: 2.5, amplitude: 300 } });
    const ant = encodeLine({ kind: 'antenna', sample: { timeS: 1.3, azimuthRad: 0.8 } });
    const pos = encodeLine({ kind: 'positioner', sample: { timeS: 1.3, cmdX: 0.5, cmdY: 2, measX: 0.49, measY: 2.01 } });
    const corrupted = det.replace('2.5000', '2.6000');
    // line 1 det, 2 ant, 3 corrupted, 4 binary junk, 5 a 6000-byte line without spaces, 6 pos
    send(`${det}\r\n${ant}\n${corrupted}\n`);
    send(Buffer.concat([Buffer.from([0x00, 0xff, 0x80, 0x1b]), Buffer.from('\n')]));
    send('Z'.repeat(6000) + '\n' + pos + '\n');
    await waitFor(() => records.length >= 3 && bad.length >= 3, 'three records and three bad lines');
    expect(records.map((r) => r.kind)).toEqual(['detection', 'antenna', 'positioner']);
    const d = records[0];
    if (d.kind !== 'detection') throw new Error('first record is not a detection');
    expect(d.detection.rangeM).toBeCloseTo(2.5, 6);
    expect(d.detection.azimuthRad).toBeCloseTo(0.75, 5);
    expect(d.detection.line).toBe(1);
    expect(bad.map((x) => x.line)).toEqual([3, 4, 5]);
    expect(bad[0].reason).toMatch(/checksum/);
    expect(bad[1].reason).toMatch(/non-printable/);
    expect(bad[2].reason).toMatch(/no newline within 4096 bytes/);
    expect(source.stats().badLines).toBe(3);
  });

  it('reports waiting when socat dies and recovers by itself when it returns', async () => {
    // Half a line in flight when the device goes: refused as cut off, with a number of its own.
    send('det 9.0 half');
    await waitFor(() => (source as unknown as { splitter: { size: number } }).splitter.size > 0, 'the half line to be read');
    await killSocat();
    await waitFor(() => source.state === 'waiting', "state 'waiting'");
    expect(existsSync(a)).toBe(false);
    const opensBefore = source.stats().opens;
    await startSocat();
    await waitFor(() => source.state === 'live', "state 'live' again");
    expect(source.stats().opens).toBe(opensBefore + 1);
    const nb = bad.length;
    send('not a record\n');
    await waitFor(() => bad.length > nb, 'a bad line after the reopen');
    expect(bad.some((x) => /cut off after 12 bytes/.test(x.reason))).toBe(true);
    const numbers = bad.map((x) => x.line);
    expect(new Set(numbers).size).toBe(numbers.length);
    const n = records.length;
    send(encodeLine({ kind: 'antenna', sample: { timeS: 9, azimuthRad: 1 } }) + '\n');
    await waitFor(() => records.length > n, 'a record after the reopen');
    const last = records[records.length - 1];
    expect(last.kind).toBe('antenna');
    expect(states).toContain('waiting');
    expect(states.filter((s) => s === 'live').length).toBeGreaterThanOrEqual(2);
  });

  it('goes waiting when the device path vanishes though the port never closed, and back when it returns', async () => {
    // socat stays up: only the link is removed, as when a driver loses a device without telling
    // the open port. The presence check must notice; the reopen then finds the link again.
    await waitFor(() => source.state === 'live', "state 'live'");
    const target = readlinkSync(a);
    const opensBefore = source.stats().opens;
    const waitingBefore = states.filter((s) => s === 'waiting').length;
    unlinkSync(a);
    await waitFor(() => states.filter((s) => s === 'waiting').length > waitingBefore, "state 'waiting' from the presence check");
    symlinkSync(target, a);
    await waitFor(() => source.state === 'live', "state 'live' after the link returns");
    expect(source.stats().opens).toBe(opensBefore + 1);
    const n = records.length;
    send(encodeLine({ kind: 'antenna', sample: { timeS: 12, azimuthRad: 2 } }) + '\n');
    await waitFor(() => records.length > n, 'a record after the return');
    expect(records[records.length - 1].kind).toBe('antenna');
  });

  it('refuses one old line as a bad line and keeps the good lines around it; three earlier lines in a row restart the clock', async () => {
    await waitFor(() => source.state === 'live', "state 'live'");
    const det = (t: number) => encodeLine({ kind: 'detection', detection: { timeS: t, azimuthRad: (10 * Math.PI) / 180, rangeM: 3, amplitude: 100 } });
    const n = records.length;
    const nb = bad.length;
    const firstLine = source.stats().lines + 1;
    // The line of the field report: valid, checksum right, but from long before 81.6 s.
    expect(det(1)).toBe('det 1.000000 10.0000 3.0000 100|C9DE');
    send(`${det(81.5)}\n${det(81.6)}\n${det(1)}\n${det(81.7)}\n`);
    await waitFor(() => records.length >= n + 3 && bad.length > nb, 'three records and the old line refused');
    const times = () => records.slice(n).map((r) => (r.kind === 'detection' ? r.detection.timeS : NaN));
    expect(times()).toEqual([81.5, 81.6, 81.7]);
    expect(bad.slice(nb)).toEqual([{ line: firstLine + 2, reason: 'time went back from 81.600 s to 1.000 s', text: det(1) }]);
    // A real restart: every line of the new clock passes on, in order, none refused.
    send(`${det(0.1)}\n${det(0.2)}\n${det(0.3)}\n${det(0.4)}\n`);
    await waitFor(() => records.length >= n + 7, 'the restarted lines');
    expect(times()).toEqual([81.5, 81.6, 81.7, 0.1, 0.2, 0.3, 0.4]);
    expect(bad.length).toBe(nb + 1);
  });

  it('waits for a device that is not there yet and goes live when it appears', async () => {
    const late = join(dir, 'late');
    const lateFar = join(dir, 'late-far');
    const src = new SerialSource({ path: late, reopenInitialMs: 50, reopenMaxMs: 200 });
    const got: SourceRecord[] = [];
    src.on('record', (r: SourceRecord) => got.push(r));
    await src.start(); // resolves although the device is absent
    expect(src.state).toBe('waiting');
    const p = spawn(SOCAT, ['-d', '-d', `pty,raw,echo=0,link=${late}`, `pty,raw,echo=0,link=${lateFar}`], { stdio: 'ignore' });
    try {
      await waitFor(() => src.state === 'live', 'the late device to be opened');
      const fd = openSync(lateFar, 'w');
      writeSync(fd, encodeLine({ kind: 'positioner', sample: { timeS: 2, cmdX: 1, cmdY: 1 } }) + '\n');
      closeSync(fd);
      await waitFor(() => got.length === 1, 'a record from the late device');
      expect(got[0].kind).toBe('positioner');
    } finally {
      await src.close();
      expect(src.state).toBe('disconnected');
      p.kill('SIGKILL');
    }
  });
});
