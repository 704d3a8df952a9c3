/**
 * Options of the live bridge (HTTP + WebSocket + pipeline), with every default filled in one place.
 *
 * `startBridge()` takes a partial `BridgeOptions`; `resolveBridgeOptions()` checks the values and
 * returns the complete set, so no other module invents its own defaults.
 */
import { fileURLToPath } from 'node:url';
import { dirname, resolve } from 'node:path';
import { EchotrailError } from '../errors.ts';
import type { Source } from '../ingest/source.ts';
import type { TrackEngine } from '../types.ts';

const repoRoot = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Serial input settings; passed on to the serial source of bridge/ingest/. */
export interface SerialSettings {
  /** Device path, e.g. /dev/ttyUSB0 or a socat pty link. */
  path: string;
  /** Line speed, bit/s. */
  baudRate: number;
  /** Data bits per character (5–8). Default 8. */
  dataBits?: 5 | 6 | 7 | 8;
  /** Parity bit. Default none. */
  parity?: 'none' | 'even' | 'odd' | 'mark' | 'space';
  /** Stop bits. Default 1. */
  stopBits?: 1 | 1.5 | 2;
  /** First wait before reopening a vanished device, ms (doubles up to `reopenMaxMs`). */
  reopenInitialMs?: number;
  /** Longest wait between reopen attempts, ms. */
  reopenMaxMs?: number;
}

/** What `startBridge()` accepts; every field is optional in `Partial<BridgeOptions>`. */
export interface BridgeOptions {
  /** TCP port for HTTP and WebSocket; 0 picks any free port. Default 8080. */
  port: number;
  /** Address to bind. Default 127.0.0.1; any other address requires a token. */
  host: string;
  /** Folder with the built dashboard (index.html). Default <repo>/web/dist. */
  staticDir: string;
  /** Folder where live runs are recorded and sessions are listed from. Default <repo>/sessions. */
  sessionsDir: string;
  /** Session file or detections CSV to replay. Ignored when `serial` is set. */
  replay?: string;
  /** Replays played one after another (demo sessions); with `loop`, round and round. Ignored when `serial` or `replay` is set. */
  playlist?: string[];
  /** Further folders whose sessions are listed and can be opened (read-only, e.g. the demo replays/). */
  extraSessionDirs: string[];
  /** Live serial input; when set, the run is recorded to `sessionsDir`. */
  serial?: SerialSettings;
  /** Replay: start again at the end. Default false. */
  loop: boolean;
  /** Replay speed factor, 0.1–50. Default 1. */
  speed: number;
  /** Replay: start playing at once (else paused at 0). Default true. */
  autoplay: boolean;
  /** Shared secret clients give as `?token=` or `x-echotrail-token` header. Generated when required and absent. */
  token?: string;
  /** Require the token even on loopback (tests). Default: true exactly when `host` is not loopback. */
  requireToken: boolean;
  /** Extra `Origin` values accepted besides the bridge's own host (e.g. a Vite dev server). */
  allowedOrigins: string[];
  /** Options handed to the tracker factory unchanged (tracker profile). */
  trackerOptions?: unknown;
  /** Builds a tracking engine; default loads bridge/tracking/tracker.ts. Injected by tests. */
  createTracker?: (trackerOptions: unknown) => TrackEngine | Promise<TrackEngine>;
  /** Builds the input source; default picks serial or replay from the options. Injected by tests. */
  createSource?: (options: ResolvedBridgeOptions) => Source | Promise<Source>;
  /** Record live runs (serial) to `sessionsDir`. Default true for serial, false for replays. */
  record?: boolean;
  /** Most scan messages per second to a client; increments in between are merged. Default 30. */
  scanRateHz: number;
  /** A client whose unsent bytes exceed this stops receiving scans until it catches up. Default 1 MiB. */
  maxBufferedBytes: number;
  /** A lagging client gets a fresh snapshot once its unsent bytes fall below this. Default 64 KiB. */
  resumeBufferedBytes: number;
  /** A client lagging this long is dropped, ms. Default 15000. */
  maxLagMs: number;
  /** Interval between pings; a client that missed the previous pong is dropped, ms. Default 15000. */
  pingIntervalMs: number;
  /** Largest accepted client frame, bytes; larger frames close the socket with 1009. Default 4096. */
  maxPayloadBytes: number;
  /** Most control messages a client may send per second; the excess is refused. Default 50. */
  maxMessagesPerSecond: number;
  /** Positions kept per track for the snapshot history. Default 600. */
  historyPoints: number;
  /** Seconds of recent detections kept for the snapshot. Default 4. */
  recentDetectionsS: number;
  /** Hard cap on the recent detections kept, whatever their rate. Default 20000. */
  maxRecentDetections: number;
  /** Largest number of connected WebSocket clients. Default 64. */
  maxClients: number;
  /** Configuration echoed into recorded session headers (bench config file). */
  benchConfig?: Record<string, unknown>;
  /** Calibration settings from the bench config file, passed to the calibration API. */
  calibration?: unknown;
  /** Where log lines go. Default stderr. */
  log: (line: string) => void;
}

export type ResolvedBridgeOptions = BridgeOptions & { record: boolean; token: string | undefined };

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '::1', '[::1]']);

/** True for addresses that only this machine can reach. */
export function isLoopback(host: string): boolean {
  return LOOPBACK.has(host) || /^127\.\d+\.\d+\.\d+$/.test(host);
}

function check(ok: boolean, what: string): void {
  if (!ok) throw new EchotrailError('E_OPTION', `bridge option ${what}`);
}

/** Fills defaults and refuses values that cannot work, with an E_OPTION error naming the field. */
export function resolveBridgeOptions(input: Partial<BridgeOptions> = {}): ResolvedBridgeOptions {
  const host = input.host ?? '127.0.0.1';
  const o: ResolvedBridgeOptions = {
    port: input.port ?? 8080,
    host,
    staticDir: resolve(input.staticDir ?? resolve(repoRoot, 'web', 'dist')),
    sessionsDir: resolve(input.sessionsDir ?? resolve(repoRoot, 'sessions')),
    replay: input.replay,
    playlist: input.playlist,
    extraSessionDirs: (input.extraSessionDirs ?? []).map((d) => resolve(d)),
    serial: input.serial,
    loop: input.loop ?? false,
    speed: input.speed ?? 1,
    autoplay: input.autoplay ?? true,
    token: input.token,
    requireToken: input.requireToken ?? !isLoopback(host),
    allowedOrigins: input.allowedOrigins ?? [],
    trackerOptions: input.trackerOptions,
    createTracker: input.createTracker,
    createSource: input.createSource,
    record: input.record ?? input.serial !== undefined,
    scanRateHz: input.scanRateHz ?? 30,
    maxBufferedBytes: input.maxBufferedBytes ?? 1024 * 1024,
    resumeBufferedBytes: input.resumeBufferedBytes ?? 64 * 1024,
    maxLagMs: input.maxLagMs ?? 15_000,
    pingIntervalMs: input.pingIntervalMs ?? 15_000,
    maxPayloadBytes: input.maxPayloadBytes ?? 4096,
    maxMessagesPerSecond: input.maxMessagesPerSecond ?? 50,
    historyPoints: input.historyPoints ?? 600,
    recentDetectionsS: input.recentDetectionsS ?? 4,
    maxRecentDetections: input.maxRecentDetections ?? 20_000,
    maxClients: input.maxClients ?? 64,
    benchConfig: input.benchConfig,
    calibration: input.calibration,
    log: input.log ?? ((line) => process.stderr.write(line + '\n')),
  };
  check(Number.isInteger(o.port) && o.port >= 0 && o.port <= 65535, `port: ${o.port} is not a TCP port (0–65535)`);
  check(o.host.length > 0, 'host: empty');
  check(o.speed >= 0.1 && o.speed <= 50, `speed: ${o.speed} is outside 0.1–50`);
  check(o.scanRateHz > 0 && o.scanRateHz <= 1000, `scanRateHz: ${o.scanRateHz} is outside (0, 1000]`);
  check(o.resumeBufferedBytes < o.maxBufferedBytes, 'resumeBufferedBytes must be below maxBufferedBytes');
  check(o.maxPayloadBytes >= 256, 'maxPayloadBytes: below 256 bytes no control message fits');
  check(o.historyPoints >= 1 && o.maxRecentDetections >= 1 && o.maxClients >= 1, 'history/detection/client caps must be ≥ 1');
  check(o.token === undefined || o.token.length >= 8, 'token: use at least 8 characters');
  if (o.serial) {
    check(o.serial.path.length > 0, 'serial.path: empty');
    check(Number.isInteger(o.serial.baudRate) && o.serial.baudRate > 0, `serial.baudRate: ${o.serial.baudRate} is not a positive integer`);
  }
  return o;
}
