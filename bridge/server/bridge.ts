/**
 * `startBridge()`: one HTTP server carrying the dashboard page, the JSON API and the WebSocket
 * stream at /ws, fed by the pipeline (source → tracker → recorder → fan-out).
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { Duplex } from 'node:stream';
import { randomBytes } from 'node:crypto';
import { WebSocketServer } from 'ws';
import { z } from 'zod';
import type { PositionerSample } from '../types.ts';
import { positionerToRadarFrame } from '../calibrate/bench-config.ts';
import type { Source, SourceState } from '../ingest/source.ts';
import { EchotrailError } from '../errors.ts';
import { Playlist } from './playlist.ts';
import type { SessionInfo } from './protocol.ts';
import { resolveBridgeOptions, type BridgeOptions, type ResolvedBridgeOptions } from './options.ts';
import { checkAccess, checkOrigin } from './security.ts';
import { serveStatic } from './static.ts';
import { handleApi, sendError } from './api.ts';
import { Hub, type HubStats } from './hub.ts';
import { Pipeline } from './pipeline.ts';
import { handleClientMessage } from './controls.ts';
import { createLiveComparison, loadCalibrationApi, loadTrackerFactory, openRecording } from './deps.ts';
import { listSessions } from '../session/list.ts';
import { openConfiguredSource, openReplaySource, sessionPath } from './sources.ts';

export type { BridgeOptions } from './options.ts';

/** A bridge that is listening. */
export interface RunningBridge {
  /** Page address, e.g. http://127.0.0.1:8080/ (with ?token= when one is required). */
  url: string;
  /** WebSocket address, e.g. ws://127.0.0.1:8080/ws (with ?token= when one is required). */
  wsUrl: string;
  /** The port actually bound (useful with port 0). */
  port: number;
  /** The address bound. */
  host: string;
  /** The token clients must present, or undefined when none is required. */
  token: string | undefined;
  /** Counters: clients, lagging, dropped, bad messages, skipped scans. */
  stats(): HubStats;
  /** The pipeline (tests and the CLI read its state). */
  pipeline: Pipeline;
  /** Replaces the input with another source (tests; the CLI uses options). */
  setSource(source: Source): Promise<void>;
  /** Stops listening, closes every client (1001), the source and the recording. */
  close(): Promise<void>;
}

const SESSIONS_CACHE_MS = 2000;

/** The calibration's positioner → radar frame mapping for live samples, or null for the identity. */
function positionerMapping(calibration: unknown): ((s: PositionerSample) => PositionerSample) | null {
  const parsed = calibrationFrame.safeParse(calibration);
  if (!parsed.success) return null;
  const { rotationDeg, translationM } = parsed.data.positionerFrame;
  if (rotationDeg === 0 && translationM.x === 0 && translationM.y === 0) return null;
  const cfg = parsed.data as unknown as Parameters<typeof positionerToRadarFrame>[1];
  return (s) => {
    const [cmd, meas] = positionerToRadarFrame([{ x: s.cmdX, y: s.cmdY }, { x: s.measX ?? 0, y: s.measY ?? 0 }], cfg);
    const out: PositionerSample = { timeS: s.timeS, cmdX: cmd.x, cmdY: cmd.y };
    if (s.measX !== undefined && s.measY !== undefined) {
      out.measX = meas.x;
      out.measY = meas.y;
    }
    if (s.target !== undefined) out.target = s.target;
    return out;
  };
}

/** The part of a calibration file (bridge/calibrate/bench-config.ts) the bridge applies itself. */
const calibrationFrame = z.object({
  positionerFrame: z.object({ rotationDeg: z.number().finite(), translationM: z.object({ x: z.number().finite(), y: z.number().finite() }) }),
});

function hostForUrl(host: string): string {
  if (host === '0.0.0.0' || host === '::') return '127.0.0.1';
  return host.includes(':') && !host.startsWith('[') ? `[${host}]` : host;
}

function refuse(socket: Duplex, status: number, reason: string): void {
  const text = { 400: 'Bad Request', 401: 'Unauthorized', 403: 'Forbidden', 404: 'Not Found', 503: 'Service Unavailable' }[status] ?? 'Error';
  socket.end(`HTTP/1.1 ${status} ${text}\r\nConnection: close\r\nContent-Type: text/plain\r\nContent-Length: ${Buffer.byteLength(reason)}\r\n\r\n${reason}`);
}

export async function startBridge(input: Partial<BridgeOptions> = {}): Promise<RunningBridge> {
  const resolved = resolveBridgeOptions(input);
  const o: ResolvedBridgeOptions = { ...resolved, token: resolved.requireToken ? (resolved.token ?? randomBytes(18).toString('base64url')) : resolved.token };
  const started = performance.now();

  // Loaded now, but a failure only matters once a source without tracks needs the tracker.
  let trackerLoadError: Error | null = null;
  const trackerFactory = o.createTracker ?? (await loadTrackerFactory().catch((e: Error) => ((trackerLoadError = e), null)));

  const pipeline = new Pipeline({
    createTracker: () => {
      if (!trackerFactory) throw trackerLoadError ?? new EchotrailError('E_OPTION', 'no tracker available');
      return trackerFactory(o.trackerOptions);
    },
    createRecorder: o.record
      ? (source, onError) =>
          openRecording({ dir: o.sessionsDir, name: source.kind === 'serial' ? 'live' : source.name, source: { kind: source.kind, name: source.name }, config: { bench: o.benchConfig ?? null, tracker: o.trackerOptions ?? null, calibration: o.calibration ?? null, positionerSamples: 'radar frame (calibration applied)' }, onError })
      : null,
    createComparison: () => createLiveComparison(o.log),
    state: { historyPoints: o.historyPoints, recentDetectionsS: o.recentDetectionsS, maxRecentDetections: o.maxRecentDetections },
    scanRateHz: o.scanRateHz,
    log: o.log,
    positionerToRadar: positionerMapping(o.calibration),
  });

  const sessionDirs = [o.sessionsDir, ...o.extraSessionDirs];
  let sessionsCache: { at: number; list: SessionInfo[] } | null = null;
  const sessions = async (): Promise<SessionInfo[]> => {
    if (sessionsCache && performance.now() - sessionsCache.at < SESSIONS_CACHE_MS) return sessionsCache.list;
    const list = await listSessions(sessionDirs);
    sessionsCache = { at: performance.now(), list };
    return list;
  };

  const replaySettings = { loop: o.loop, speed: o.speed, autoplay: o.autoplay };
  // The speed chosen on the dashboard carries over to the next session (playlist or picker).
  const currentSpeed = (): number => pipeline.replayState()?.speed ?? replaySettings.speed;
  // A live serial run is never replaced from the dashboard: that would stop the recording.
  const openSession = async (sessionId: string): Promise<void> => {
    if (pipeline.current?.kind === 'serial') throw new EchotrailError('E_OPTION', 'the bridge is on a live serial input; restart it without --serial to replay sessions');
    const path = await sessionPath(sessionDirs, sessionId);
    const source = await openReplaySource(path, { ...replaySettings, speed: currentSpeed() });
    playlist?.stop();
    await pipeline.setSource(source);
  };

  const playlist = !o.serial && !o.replay && !o.createSource && (o.playlist?.length ?? 0) > 1
    ? new Playlist(o.playlist as string[], o.loop, (path) => openReplaySource(path, { ...replaySettings, speed: currentSpeed(), loop: false, autoplay: true }), (s) => pipeline.setSource(s), o.log)
    : null;
  if (playlist) {
    pipeline.on('source-state', (s: SourceState) => playlist.onState(s));
    pipeline.playlistInfo = () => playlist.info();
  }

  const hub = new Hub({
    maxBufferedBytes: o.maxBufferedBytes,
    resumeBufferedBytes: o.resumeBufferedBytes,
    maxLagMs: o.maxLagMs,
    pingIntervalMs: o.pingIntervalMs,
    maxMessagesPerSecond: o.maxMessagesPerSecond,
    hello: () => pipeline.hello(),
    snapshot: () => pipeline.snapshot(),
    onClientMessage: (msg, reply) => handleClientMessage({ pipeline, openSession, sessions }, msg, reply),
  });
  pipeline.on('scan', (scan) => hub.broadcast(scan));
  pipeline.on('message', (msg) => hub.broadcast(msg));
  pipeline.on('resync', () => hub.resync());

  const apiContext = {
    status: () => pipeline.status(),
    replay: () => pipeline.replayState(),
    clients: () => hub.size,
    sessions,
    calibration: async () => {
      const api = await loadCalibrationApi();
      if (!api) return null;
      // The bench's current calibration is the starting point unless the request brings its own.
      return (body: unknown) => {
        const withConfig = o.calibration !== undefined && body && typeof body === 'object' && !('config' in body) ? { ...body, config: o.calibration } : body;
        return api(withConfig);
      };
    },
    uptimeS: () => (performance.now() - started) / 1000,
  };

  const server = createServer((req: IncomingMessage, res: ServerResponse) => {
    const pathname = new URL(req.url ?? '/', 'http://x').pathname;
    if (pathname.startsWith('/api/')) {
      const verdict = checkAccess(req, o);
      if (!verdict.ok) return sendError(res, verdict.status, 'E_ACCESS', verdict.reason);
      // A request that does work (POST /api/calibrate) must come from the bridge's own page: any
      // other web page the operator has open could otherwise post to the loopback port.
      if (req.method !== 'GET' && req.method !== 'HEAD') {
        const origin = checkOrigin(req, o);
        if (!origin.ok) return sendError(res, origin.status, 'E_ACCESS', origin.reason);
      }
      void handleApi(apiContext, req, res, pathname);
      return;
    }
    void serveStatic(o.staticDir, req, res, pathname).catch(() => res.destroy());
  });
  server.headersTimeout = 10_000;
  server.requestTimeout = 30_000;

  const wss = new WebSocketServer({ noServer: true, maxPayload: o.maxPayloadBytes, perMessageDeflate: false });
  server.on('upgrade', (req: IncomingMessage, socket: Duplex, head: Buffer) => {
    socket.on('error', () => socket.destroy());
    const pathname = new URL(req.url ?? '/', 'http://x').pathname;
    if (pathname !== '/ws') return refuse(socket, 404, 'the WebSocket endpoint is /ws');
    const origin = checkOrigin(req, o);
    if (!origin.ok) return refuse(socket, origin.status, origin.reason);
    const access = checkAccess(req, o);
    if (!access.ok) return refuse(socket, access.status, access.reason);
    if (hub.size >= o.maxClients) return refuse(socket, 503, `too many clients (${o.maxClients})`);
    wss.handleUpgrade(req, socket, head, (ws) => hub.add(ws));
  });
  server.on('clientError', (_err, socket) => socket.destroy());

  try {
    await new Promise<void>((resolveListen, reject) => {
      server.once('error', reject);
      server.listen(o.port, o.host, () => {
        server.off('error', reject);
        resolveListen();
      });
    });
  } catch (err) {
    // The hub's ping timer and the pipeline are already running: left open, they kept the
    // process alive after `start` had reported the busy port.
    playlist?.stop();
    hub.close();
    wss.close();
    await pipeline.close();
    throw err;
  }
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : o.port;
  const base = `${hostForUrl(o.host)}:${port}`;
  const query = o.requireToken && o.token ? `?token=${encodeURIComponent(o.token)}` : '';

  try {
    const source = await openConfiguredSource(o);
    if (source) await pipeline.setSource(source);
  } catch (err) {
    await new Promise<void>((r) => server.close(() => r()));
    hub.close();
    await pipeline.close();
    throw err;
  }

  let closing: Promise<void> | null = null;
  return {
    url: `http://${base}/${query}`,
    wsUrl: `ws://${base}/ws${query}`,
    port,
    host: o.host,
    token: o.requireToken ? o.token : undefined,
    stats: () => hub.stats,
    pipeline,
    setSource: (source) => pipeline.setSource(source),
    close: () =>
      (closing ??= (async () => {
        playlist?.stop();
        hub.close();
        wss.close();
        const closed = new Promise<void>((r) => server.close(() => r()));
        server.closeAllConnections();
        await pipeline.close();
        await closed;
      })()),
  };
}
