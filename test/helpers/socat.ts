/**
 * A pseudo-terminal pair from socat for serial tests: the bridge opens one end as its serial
 * port, the test writes protocol lines into the other. Killing socat makes the port vanish the
 * way an unplugged USB adapter does; starting it again with the same links brings it back.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { closeSync, existsSync, mkdirSync, openSync, writeSync } from 'node:fs';
import { join } from 'node:path';

export const SOCAT = '/usr/bin/socat';

/** Whether socat can be used; under CI=true its absence is an error, elsewhere a skip. */
export function socatAvailable(): boolean {
  const ok = existsSync(SOCAT) && spawnSync(SOCAT, ['-V'], { stdio: 'ignore' }).status === 0;
  if (!ok && process.env.CI === 'true') throw new Error(`socat is required under CI=true but ${SOCAT} is missing`);
  if (!ok) process.stderr.write(`skipping serial tests: ${SOCAT} not found (install socat to run them)\n`);
  return ok;
}

export class PtyPair {
  /** The end the bridge opens as its serial port. */
  readonly device: string;
  /** The end the test writes to (the "hardware"). */
  readonly hardware: string;
  private proc: ChildProcess | null = null;
  private fd: number | null = null;

  constructor(dir: string) {
    mkdirSync(dir, { recursive: true });
    this.device = join(dir, 'bridge-end');
    this.hardware = join(dir, 'hw-end');
  }

  /** Starts socat and waits until both links exist. */
  async start(): Promise<void> {
    this.proc = spawn(SOCAT, ['-d', '-d', `pty,raw,echo=0,link=${this.device}`, `pty,raw,echo=0,link=${this.hardware}`], { stdio: ['ignore', 'ignore', 'pipe'] });
    this.proc.stderr?.resume();
    for (let i = 0; i < 200 && !(existsSync(this.device) && existsSync(this.hardware)); i++) await new Promise((r) => setTimeout(r, 25));
    if (!existsSync(this.device) || !existsSync(this.hardware)) throw new Error('socat did not create the pty links');
  }

  /** Writes text into the hardware end. */
  write(text: string): void {
    if (this.fd === null) this.fd = openSync(this.hardware, 'w');
    const buf = Buffer.from(text, 'latin1');
    for (let off = 0; off < buf.length; ) off += writeSync(this.fd, buf, off, buf.length - off);
  }

  /** Kills socat (the port vanishes) and waits for it to exit. */
  async stop(): Promise<void> {
    if (this.fd !== null) {
      try { closeSync(this.fd); } catch { /* already gone */ }
      this.fd = null;
    }
    const p = this.proc;
    this.proc = null;
    if (!p || p.exitCode !== null) return;
    const exited = new Promise((r) => p.once('exit', r));
    p.kill('SIGTERM');
    await exited;
  }
}
