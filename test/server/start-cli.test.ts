/**
 * `echotrail start` as a user runs it: a child process, its printed address, a WebSocket client,
 * then SIGINT for a clean exit.
 */
import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { createServer } from 'node:net';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Recorder } from '../../bridge/session/recorder.ts';
import { trackAt } from '../helpers/scripted-source.ts';
import { TestClient } from '../helpers/ws-client.ts';

const root = join(import.meta.dirname, '..', '..');

function session(dir: string): string {
  const rec = new Recorder({ dir, name: 'cli', source: { kind: 'simulator', name: 'test' } });
  rec.open();
  for (let i = 0; i < 50; i++) rec.record({ kind: 'track', update: trackAt(3, i * 0.1, i * 0.01, 2) });
  const path = rec.status().path as string;
  rec.close();
  return path;
}

describe('echotrail start', () => {
  it('prints the address, streams the replay, and exits 0 on SIGINT', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'et-cli-'));
    const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bridge/cli/main.ts'), 'start', '--no-build', '--replay', session(dir), '--sessions', dir], {
      cwd: root,
      env: { ...process.env, PORT: '0' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    child.stdout.on('data', (d: Buffer) => (out += d));
    const exited = new Promise<number | null>((r) => child.on('exit', (c) => r(c)));
    while (!/websocket\s+(ws:\S+)/.test(out) && child.exitCode === null) await new Promise((r) => setTimeout(r, 50));
    const wsUrl = /websocket\s+(ws:\S+)/.exec(out)![1];
    expect(out).toMatch(/dashboard\s+http:\/\/127\.0\.0\.1:\d+\//);
    const c = await TestClient.connect(wsUrl);
    const scan = await c.next('scan', (s) => s.updates.some((u) => u.id === 3));
    expect(scan.updates[0].id).toBe(3);
    await c.close();
    child.kill('SIGINT');
    expect(await exited).toBe(0);
  });

  it('exits 2 on an unknown option and 1 with a coded message on a missing replay file', async () => {
    const runCli = (args: string[]): Promise<{ code: number | null; err: string }> =>
      new Promise((resolve) => {
        const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bridge/cli/main.ts'), 'start', '--no-build', '--port', '0', ...args], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
        let err = '';
        child.stderr.on('data', (d: Buffer) => (err += d));
        child.on('exit', (code) => resolve({ code, err }));
      });
    expect((await runCli(['--frobnicate'])).code).toBe(2);
    const missing = await runCli(['--replay', '/nonexistent/run.session.jsonl']);
    expect(missing.code).toBe(1);
    expect(missing.err).toMatch(/E_PATH: replay file '\/nonexistent\/run.session.jsonl' not found/);
  });

  it('exits 1 at once, with the reason, when its port is taken (nothing left running)', async () => {
    const blocker = createServer();
    await new Promise<void>((r) => blocker.listen(0, '127.0.0.1', () => r()));
    const port = (blocker.address() as { port: number }).port;
    try {
      const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bridge/cli/main.ts'), 'start', '--no-build', '--port', String(port), '--replay', session(mkdtempSync(join(tmpdir(), 'et-cli-')))], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'] });
      let err = '';
      child.stderr.on('data', (d: Buffer) => (err += d));
      // Before the fix the process printed the reason and then stayed up: the hub's timer and the
      // opened pipeline kept the event loop alive. 20 s is far beyond a normal exit (about 1 s).
      const code = await new Promise<number | null | 'hung'>((resolve) => {
        const timer = setTimeout(() => (child.kill('SIGKILL'), resolve('hung')), 20_000);
        child.on('exit', (c) => (clearTimeout(timer), resolve(c)));
      });
      expect(code).toBe(1);
      expect(err).toMatch(/port in use; choose another with --port or PORT/);
    } finally {
      blocker.close();
    }
  }, 30_000);
});
