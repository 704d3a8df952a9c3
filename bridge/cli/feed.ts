/**
 * `echotrail feed`: plays a simulated bench run into a serial port (or stdout) in the line
 * protocol (docs/line-protocol.md), in real time. It stands in for the acquisition hardware, so
 * the live path of the bridge (serial → tracker → recorder → dashboard) can be tried and taught
 * without a radar: pair two pseudo-terminals with socat, start the bridge on one end and feed
 * the other.
 */
import { Command, InvalidArgumentError } from 'commander';
import { parseOrExit } from './parse.ts';
import { EchotrailError } from '../errors.ts';
import { SerialPort } from 'serialport';
import { setTimeout as sleep } from 'node:timers/promises';
import { wireRecords, wireTime } from '../sim/wire-records.ts';
import { resolveScenarioOptions } from '../sim/scenario.ts';
import { SCENARIOS, builtinScenario } from '../sim/scenarios.ts';
import { encodeLine } from '../ingest/line-protocol.ts';

/** Options of one feed, after defaults. */
export interface FeedOptions {
  /** Built-in scenario name (bridge/sim/scenarios.ts). */
  scenario: string;
  seed: number;
  /** Serial device to write to; null writes to stdout. */
  port: string | null;
  baudRate: number;
  /** Run-time seconds per wall-clock second; 0 writes as fast as the port takes it. */
  speed: number;
  /** Start the run again when it ends (device time keeps counting up). */
  loop: boolean;
  /** Antenna heartbeat records per second (rotating antenna only). */
  antennaRateHz: number;
}

export function resolveFeedOptions(o: Partial<FeedOptions> = {}): FeedOptions {
  return {
    scenario: o.scenario ?? 'turntable',
    seed: o.seed ?? 1,
    port: o.port ?? null,
    baudRate: o.baudRate ?? 115200,
    speed: o.speed ?? 1,
    loop: o.loop ?? false,
    antennaRateHz: o.antennaRateHz ?? 10,
  };
}

/** Writes the feed; resolves when the run ends (never, with loop) or the port closes. */
export async function feed(options: FeedOptions, write: (line: string) => Promise<void>, signal?: AbortSignal): Promise<number> {
  const sc = resolveScenarioOptions({ ...builtinScenario(options.scenario), seed: options.seed });
  const startMs = performance.now();
  let lines = 0;
  for (let pass = 0; pass === 0 || options.loop; pass++) {
    for (const rec of wireRecords(sc, pass * sc.durationS, options.antennaRateHz)) {
      if (signal?.aborted) return lines;
      if (options.speed > 0) {
        const dueMs = startMs + (wireTime(rec) / options.speed) * 1000;
        const waitMs = dueMs - performance.now();
        if (waitMs > 1) await sleep(waitMs);
      }
      await write(encodeLine(rec) + '\n');
      lines++;
    }
  }
  return lines;
}

function positive(v: string): number {
  const n = Number(v);
  if (!Number.isFinite(n) || n < 0) throw new InvalidArgumentError('expected a number ≥ 0');
  return n;
}

/** Writes one line; waits for 'drain' when the port buffers, but not past an abort (a lost port never drains). */
function writeOrAbort(port: SerialPort, line: string, signal: AbortSignal): Promise<void> {
  return new Promise((res) => {
    if (port.write(line) || signal.aborted) return res();
    const done = (): void => {
      port.off('drain', done);
      signal.removeEventListener('abort', done);
      res();
    };
    port.once('drain', done);
    signal.addEventListener('abort', done, { once: true });
  });
}

export async function run(argv: string[]): Promise<number> {
  const cmd = new Command('echotrail feed')
    .description('Play a simulated bench run into a serial port in the line protocol, in real time (a stand-in for the acquisition hardware).')
    .option('--scenario <name>', `built-in scenario (${Object.keys(SCENARIOS).join(', ')})`, 'turntable')
    .option('--seed <n>', 'PRNG seed', positive, 1)
    .option('--port <path>', 'serial device to write to, e.g. one end of a socat pty pair (default: stdout)')
    .option('--baud <n>', 'serial line speed, bit/s', positive, 115200)
    .option('--speed <x>', 'run seconds per wall-clock second; 0 = as fast as possible', positive, 1)
    .option('--loop', 'start the run again when it ends', false);
  const stop = parseOrExit(cmd, argv);
  if (stop !== null) return stop;
  const f = cmd.opts<{ scenario: string; seed: number; port?: string; baud: number; speed: number; loop: boolean }>();
  const options = resolveFeedOptions({ scenario: f.scenario, seed: f.seed, port: f.port ?? null, baudRate: f.baud, speed: f.speed, loop: f.loop });
  const abort = new AbortController();
  process.once('SIGINT', () => abort.abort());
  if (!options.port) {
    const n = await feed(options, (line) => new Promise((res) => (process.stdout.write(line) ? res() : process.stdout.once('drain', res))), abort.signal);
    process.stderr.write(`echotrail feed: ${n} lines written\n`);
    return 0;
  }
  const port = new SerialPort({ path: options.port, baudRate: options.baudRate, autoOpen: false });
  // The feed stands in for hardware that can be unplugged: losing the port (socat killed, a write
  // failing with EIO) ends the feed with E_SERIAL, never with an unhandled 'error' event. The
  // listener is there before the port opens, so no error can come without one.
  let lost: Error | null = null;
  port.on('error', (err: Error) => {
    lost ??= err;
    abort.abort();
  });
  await new Promise<void>((res, rej) => port.open((err) => (err ? rej(new EchotrailError('E_SERIAL', `cannot open '${options.port}': ${err.message}`)) : res())));
  port.on('close', (err?: Error) => {
    if (err) lost ??= err;
    abort.abort();
  });
  process.stderr.write(`echotrail feed: scenario ${options.scenario} → ${options.port} at ${options.speed}× (Ctrl-C stops)\n`);
  const n = await feed(options, (line) => writeOrAbort(port, line, abort.signal), abort.signal);
  if (lost) {
    if (port.isOpen) port.close(() => undefined);
    const e = lost as Error;
    throw new EchotrailError('E_SERIAL', `lost '${options.port}' after ${n} lines: ${e.message}; start the feed again when the port is back`, { cause: e });
  }
  await new Promise<void>((res) => port.drain(() => res()));
  if (port.isOpen) await new Promise<void>((res) => port.close(() => res()));
  process.stderr.write(`echotrail feed: ${n} lines written\n`);
  return 0;
}
