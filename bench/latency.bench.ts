/**
 * Latency from a protocol line written into the pseudo-terminal to the WebSocket client that
 * receives (a) the scan carrying that detection and (b) the track update made from it.
 * p50 and p99 at 300 and 3,000 detections/s, with 1 and with 20 connected clients.
 *
 * The bridge runs as `npm start` would run it (`echotrail start --serial …`, its own process);
 * this process writes the lines in real time and hosts the clients, so one clock times both ends.
 * Baseline, measured in the same run: the same lines through the same kind of pty pair to a plain
 * reader, without the bridge. The "× baseline" ratio is the bridge's p50 against the pty's p50.
 *
 *   npm run bench -- latency
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createWriteStream, mkdtempSync, readFileSync, writeFileSync, type WriteStream } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import WebSocket from 'ws';
import { SerialPort } from 'serialport';
import { benchLines, resolveBenchRunOptions, trackerOptionsFor, type BenchRunOptions } from '../test/helpers/bench-run.ts';
import { PtyPair, socatAvailable } from '../test/helpers/socat.ts';

const root = join(fileURLToPath(import.meta.url), '..', '..');
const SECONDS = Number(process.env.BENCH_SECONDS ?? 6);
const WARMUP_S = 1;

function quantile(sorted: number[], q: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

function fmt(ms: number): string {
  return Number.isFinite(ms) ? ms.toFixed(2).padStart(7) : '    n/a';
}

/** Writes the run's lines in real time, noting in `written` when (performance.now) each detection time went out. */
async function writeRealTime(out: WriteStream, run: Partial<BenchRunOptions>, seconds: number, written: Map<string, number>): Promise<void> {
  const lines = [...benchLines({ ...run, durationS: seconds })];
  const start = performance.now();
  let i = 0;
  while (i < lines.length) {
    const due = (performance.now() - start) / 1000;
    let chunk = '';
    const now = performance.now();
    for (; i < lines.length && lines[i].timeS <= due; i++) {
      chunk += lines[i].line;
      if (lines[i].record.kind === 'detection') written.set(lines[i].timeS.toFixed(6), now);
    }
    if (chunk) out.write(chunk);
    await new Promise((r) => setTimeout(r, 1));
  }
}

/** Line → read latency through a bare pty pair read with serialport, as the bridge reads it: the floor. */
async function baseline(dir: string, run: Partial<BenchRunOptions>): Promise<number[]> {
  const pty = new PtyPair(join(dir, 'base'));
  await pty.start();
  const lat: number[] = [];
  const written = new Map<string, number>();
  let buf = '';
  const reader = new SerialPort({ path: pty.device, baudRate: 115200 });
  reader.on('error', () => undefined);
  reader.on('data', (chunk: Buffer) => {
    const now = performance.now();
    buf += chunk.toString();
    let nl: number;
    while ((nl = buf.indexOf('\n')) >= 0) {
      const line = buf.slice(0, nl);
      buf = buf.slice(nl + 1);
      const m = /^det (\S+)/.exec(line);
      const w = m ? written.get(m[1]) : undefined;
      if (w !== undefined && Number(m![1]) > WARMUP_S) lat.push(now - w);
    }
  });
  const out = createWriteStream(pty.hardware);
  await writeRealTime(out, run, SECONDS, written);
  await new Promise((r) => setTimeout(r, 200));
  await new Promise((r) => reader.close(r));
  out.destroy();
  await pty.stop();
  return lat.sort((a, b) => a - b);
}

async function startBridgeProcess(dir: string, device: string, run: BenchRunOptions): Promise<{ child: ChildProcess; wsUrl: string }> {
  const config = join(dir, `bench-${Date.now()}.json`);
  writeFileSync(config, JSON.stringify({ tracker: trackerOptionsFor(run), sessionsDir: join(dir, 'sessions') }));
  const child = spawn(process.execPath, ['--import', 'tsx', join(root, 'bridge/cli/main.ts'), 'start', '--no-build', '--port', '0', '--serial', device, '--config', config], {
    cwd: root,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  let out = '';
  child.stdout!.on('data', (d: Buffer) => (out += d));
  while (!/websocket\s+(ws:\S+)/.test(out)) {
    if (child.exitCode !== null) throw new Error(`bridge exited with ${child.exitCode}`);
    await new Promise((r) => setTimeout(r, 50));
  }
  return { child, wsUrl: /websocket\s+(ws:\S+)/.exec(out)![1] };
}

interface Figures {
  detection: number[];
  update: number[];
  clientsReceived: number[];
  /** The bridge's own latencyMs (arrival at the bridge → scan sent), as its source messages report it. */
  bridgeReported: number[];
  /** Resident memory of the bridge process at the end of the case, MiB (Linux /proc). */
  rssMiB: number;
}

function rssMiB(pid: number | undefined): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : NaN;
  } catch {
    return NaN;
  }
}

async function measure(dir: string, rate: number, clients: number): Promise<Figures> {
  // One reflector plus stationary ones, 10 revolutions a second: 10 detections/s per reflector.
  const run = resolveBenchRunOptions({ periodS: 0.1, clutter: Math.round(rate / 10) - 1, durationS: SECONDS });
  const pty = new PtyPair(join(dir, `r${rate}c${clients}`));
  await pty.start();
  const { child, wsUrl } = await startBridgeProcess(dir, pty.device, run);
  const written = new Map<string, number>();
  const fig: Figures = { detection: [], update: [], clientsReceived: [], bridgeReported: [], rssMiB: NaN };
  const sockets: WebSocket[] = [];
  for (let c = 0; c < clients; c++) {
    const ws = new WebSocket(wsUrl);
    let received = 0;
    ws.on('message', (data) => {
      const now = performance.now();
      const msg = JSON.parse(String(data)) as {
        type: string;
        detections?: { timeS: number }[];
        updates?: { timeS: number; moving: boolean }[];
        source?: { latencyMs: number | null; detectionsPerSecond: number };
      };
      if (c === 0 && msg.type === 'source' && msg.source?.latencyMs != null && msg.source.detectionsPerSecond > 0) fig.bridgeReported.push(msg.source.latencyMs);
      if (msg.type !== 'scan') return;
      received++;
      fig.clientsReceived[c] = received;
      for (const d of msg.detections ?? []) {
        const w = written.get(d.timeS.toFixed(6));
        if (w !== undefined && d.timeS > WARMUP_S) fig.detection.push(now - w);
      }
      for (const u of msg.updates ?? []) {
        const w = written.get(u.timeS.toFixed(6));
        if (w !== undefined && u.timeS > WARMUP_S) fig.update.push(now - w);
      }
    });
    await new Promise((r) => ws.once('open', r));
    sockets.push(ws);
  }
  const out = createWriteStream(pty.hardware);
  // The map fills as lines are written; the clients look times up in it as scans arrive.
  await writeRealTime(out, run, SECONDS, written);
  await new Promise((r) => setTimeout(r, 500));
  fig.rssMiB = rssMiB(child.pid);
  for (const ws of sockets) ws.close();
  out.destroy();
  child.kill('SIGINT');
  await new Promise((r) => child.once('exit', r));
  await pty.stop();
  fig.detection.sort((a, b) => a - b);
  fig.update.sort((a, b) => a - b);
  fig.bridgeReported.sort((a, b) => a - b);
  return fig;
}

async function main(): Promise<void> {
  if (!socatAvailable()) return;
  const dir = mkdtempSync(join(tmpdir(), 'et-latency-'));
  process.stdout.write(`latency: line written to the pty → scan at a WebSocket client; ${SECONDS} s per case (first ${WARMUP_S} s not counted)\n`);
  const base = await baseline(dir, resolveBenchRunOptions({ periodS: 0.1, clutter: 29 }));
  const baseP50 = quantile(base, 0.5);
  process.stdout.write(`baseline (bare pty → reader, 300 det/s): p50 ${fmt(baseP50)} ms  p99 ${fmt(quantile(base, 0.99))} ms  (${base.length} lines)\n\n`);
  process.stdout.write(`load average at start: ${loadavg().map((l) => l.toFixed(1)).join(' ')} on ${cpus().length} cores (latencies include waiting for the CPU)\n`);
  process.stdout.write('  det/s  clients |  detection p50     p99 |  track update p50     p99 | bridge-reported p50 | scans/client (min–max) | bridge RSS MiB | × baseline (p50)\n');
  for (const [rate, clients] of [[300, 1], [3000, 1], [300, 20], [3000, 20]] as const) {
    const f = await measure(dir, rate, clients);
    const counts = f.clientsReceived.filter((n) => n !== undefined);
    process.stdout.write(
      `  ${String(rate).padStart(5)}  ${String(clients).padStart(7)} | ${fmt(quantile(f.detection, 0.5))} ${fmt(quantile(f.detection, 0.99))} |` +
        `     ${fmt(quantile(f.update, 0.5))} ${fmt(quantile(f.update, 0.99))} |             ${fmt(quantile(f.bridgeReported, 0.5))} | ${String(Math.min(...counts)).padStart(10)}–${String(Math.max(...counts)).padEnd(10)} | ${f.rssMiB.toFixed(0).padStart(14)} |` +
        ` ${(quantile(f.detection, 0.5) / baseP50).toFixed(1)}\n`,
    );
  }
}

await main();
