/**
 * `echotrail start` (`npm start`): builds the dashboard when needed, starts the bridge and prints
 * its address. Without --serial or --replay it plays the demo sessions of replays/ in a loop.
 * Precedence of settings: command line, then environment (PORT), then --config file, then defaults.
 */
import { Command, InvalidArgumentError, Option } from 'commander';
import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import { EchotrailError } from '../errors.ts';
import { loadBenchConfig, bridgeOptionsFromConfig } from '../config.ts';
import { startBridge } from '../server/bridge.ts';
import type { BridgeOptions } from '../server/options.ts';
import { SESSION_SUFFIX } from '../session/format.ts';
import { ensureWebBuild, REPO_ROOT } from '../server/web-build.ts';

function int(name: string, lo: number, hi: number) {
  return (v: string): number => {
    const n = Number(v);
    if (!Number.isInteger(n) || n < lo || n > hi) throw new InvalidArgumentError(`${name} must be an integer ${lo}–${hi}`);
    return n;
  };
}

function speed(v: string): number {
  const n = Number(v);
  if (!(n >= 0.1 && n <= 50)) throw new InvalidArgumentError('speed must be 0.1–50');
  return n;
}

function program(): Command {
  return new Command('echotrail start')
    .description('Serve the dashboard and stream a demo replay, a recorded session or a live serial port over WebSocket (/ws).')
    .addOption(new Option('-p, --port <n>', 'TCP port for the page and the WebSocket (default: 8080); 0 = any free port').env('PORT').argParser(int('port', 0, 65535)))
    .option('--host <address>', 'address to bind (default: 127.0.0.1); any other address requires a token')
    .option('--serial <path>', 'live input: serial device in the line protocol (docs/line-protocol.md); recorded to the sessions folder')
    .option('--baud <n>', 'serial line speed, bit/s (default: 115200)', int('baud', 50, 10_000_000))
    .option('--replay <file>', 'replay a session (.session.jsonl) or a detections CSV instead of the demo')
    .option('--config <file>', 'bench settings (JSON): serial, tracker options/profile, calibration, sessions folder')
    .option('--sessions <dir>', 'folder for recorded sessions (default: <repo>/sessions)')
    .option('--token <secret>', 'token clients must give (?token=); generated when binding beyond loopback without one')
    .option('--speed <x>', 'replay speed factor, 0.1–50 (default: 1)', speed)
    .option('--no-loop', 'play replays once instead of starting over at the end')
    .option('--paused', 'open replays paused at 0 s')
    .option('--allow-origin <origin...>', 'extra page origins allowed to open the WebSocket (e.g. http://localhost:5173)')
    .option('--no-build', 'do not build the dashboard even when web/dist is missing or stale')
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s), writeOut: (s) => process.stdout.write(s) });
}

interface StartFlags {
  port?: number;
  host?: string;
  serial?: string;
  baud?: number;
  replay?: string;
  config?: string;
  sessions?: string;
  token?: string;
  speed?: number;
  loop: boolean;
  paused?: boolean;
  allowOrigin?: string[];
  build: boolean;
}

/** The demo sessions shipped in replays/, in name order. */
async function demoSessions(dir: string): Promise<string[]> {
  const names = await readdir(dir).catch(() => [] as string[]);
  return names.filter((n) => n.endsWith(SESSION_SUFFIX)).sort().map((n) => join(dir, n));
}

export async function run(argv: string[]): Promise<number> {
  const cmd = program();
  try {
    cmd.parse(argv, { from: 'user' });
  } catch (err) {
    const code = (err as { exitCode?: number }).exitCode;
    return code === 0 ? 0 : 2;
  }
  const f = cmd.opts<StartFlags>();
  try {
    const fromConfig = f.config ? await bridgeOptionsFromConfig(await loadBenchConfig(f.config)) : {};
    const options: Partial<BridgeOptions> = { ...fromConfig, loop: f.loop, autoplay: !f.paused };
    options.port = f.port ?? fromConfig.port ?? 8080;
    if (f.host) options.host = f.host;
    if (f.sessions) options.sessionsDir = f.sessions;
    if (f.token) options.token = f.token;
    if (f.speed !== undefined) options.speed = f.speed;
    if (f.allowOrigin) options.allowedOrigins = [...(fromConfig.allowedOrigins ?? []), ...f.allowOrigin];
    if (f.serial) options.serial = { ...(fromConfig.serial ?? {}), path: f.serial, baudRate: f.baud ?? fromConfig.serial?.baudRate ?? 115200 };
    else if (f.baud && options.serial) options.serial = { ...options.serial, baudRate: f.baud };
    const replaysDir = join(REPO_ROOT, 'replays');
    options.extraSessionDirs = [replaysDir];
    if (f.replay) {
      options.replay = f.replay;
      delete options.serial;
    } else if (!options.serial) {
      options.playlist = await demoSessions(replaysDir);
      if (!options.playlist.length) process.stderr.write(`echotrail: no demo sessions in ${replaysDir}; starting idle (open a session from the dashboard, or use --replay / --serial)\n`);
    }
    if (f.build) await ensureWebBuild((line) => process.stderr.write(line + '\n'));

    const bridge = await startBridge(options);
    const what = options.serial ? `serial ${options.serial.path} (recording to ${options.sessionsDir ?? 'sessions/'})` : options.replay ? `replay ${options.replay}` : options.playlist?.length ? `demo: ${options.playlist.length} session(s) from replays/` : 'idle';
    process.stdout.write(`echotrail: ${what}\n  dashboard  ${bridge.url}\n  websocket  ${bridge.wsUrl}\n`);
    await new Promise<void>((resolve) => {
      const stop = (): void => {
        process.stderr.write(`echotrail: stopping${options.serial ? '; closing the recording' : ''}\n`);
        void bridge.close().then(resolve);
      };
      process.once('SIGINT', stop);
      process.once('SIGTERM', stop);
    });
    return 0;
  } catch (err) {
    const code = err instanceof EchotrailError ? `${err.code}: ` : '';
    const msg = (err as NodeJS.ErrnoException).code === 'EADDRINUSE' ? `port in use; choose another with --port or PORT` : (err as Error).message;
    process.stderr.write(`echotrail start: ${code}${msg}\n`);
    return 1;
  }
}
