/**
 * The small JSON HTTP API next to the page:
 * - GET  /api/health    → { ok, protocol, uptimeS, clients, source, replay }
 * - GET  /api/sessions  → { sessions: SessionInfo[] }
 * - POST /api/calibrate → whatever bridge/calibrate/api.ts answers (when that module exists)
 * Errors are JSON `{ error: { code, message } }` with a fitting status.
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import { EchotrailError } from '../errors.ts';
import type { ReplayState, SessionInfo, SourceStatus } from './protocol.ts';
import { PROTOCOL_VERSION } from './protocol.ts';

/** What the API reads from the running bridge. */
export interface ApiContext {
  /** Current source status. */
  status(): SourceStatus;
  /** Current replay state, or null for a live source. */
  replay(): ReplayState | null;
  /** Connected WebSocket clients. */
  clients(): number;
  /** Recorded sessions. */
  sessions(): Promise<SessionInfo[]>;
  /** The calibration handler, or null when calibration is not available. */
  calibration(): Promise<((request: unknown) => unknown) | null>;
  /** Seconds since the bridge started. */
  uptimeS(): number;
}

/** Largest accepted request body, bytes. */
const MAX_BODY = 1024 * 1024;

export function sendJson(res: ServerResponse, status: number, body: unknown): void {
  const text = JSON.stringify(body);
  res.writeHead(status, { 'content-type': 'application/json; charset=utf-8', 'content-length': Buffer.byteLength(text), 'cache-control': 'no-store' });
  res.end(text);
}

export function sendError(res: ServerResponse, status: number, code: string, message: string): void {
  sendJson(res, status, { error: { code, message } });
}

async function readJsonBody(req: IncomingMessage): Promise<unknown> {
  const chunks: Buffer[] = [];
  let size = 0;
  for await (const chunk of req as AsyncIterable<Buffer>) {
    size += chunk.length;
    if (size > MAX_BODY) throw new EchotrailError('E_PROTOCOL', `request body over ${MAX_BODY} bytes`);
    chunks.push(chunk);
  }
  try {
    return JSON.parse(Buffer.concat(chunks).toString('utf8') || 'null');
  } catch {
    throw new EchotrailError('E_PROTOCOL', 'request body is not valid JSON');
  }
}

export async function handleApi(ctx: ApiContext, req: IncomingMessage, res: ServerResponse, pathname: string): Promise<void> {
  try {
    if (pathname === '/api/health' && req.method === 'GET') {
      return sendJson(res, 200, {
        ok: true,
        protocol: PROTOCOL_VERSION,
        uptimeS: Math.round(ctx.uptimeS()),
        clients: ctx.clients(),
        source: ctx.status(),
        replay: ctx.replay(),
      });
    }
    if (pathname === '/api/sessions' && req.method === 'GET') return sendJson(res, 200, { sessions: await ctx.sessions() });
    if (pathname === '/api/calibrate' && req.method === 'POST') {
      const handler = await ctx.calibration();
      if (!handler) return sendError(res, 501, 'E_CALIBRATION', 'calibration is not available in this build');
      const body = await readJsonBody(req);
      const answer = await handler(body);
      // The calibration answers { ok: false, code, message } for requests it cannot use.
      const refused = typeof answer === 'object' && answer !== null && (answer as { ok?: unknown }).ok === false;
      return sendJson(res, refused ? 400 : 200, answer);
    }
    if (['/api/health', '/api/sessions', '/api/calibrate'].includes(pathname)) return sendError(res, 405, 'E_PROTOCOL', `${req.method} not allowed on ${pathname}`);
    return sendError(res, 404, 'E_PROTOCOL', `no API at ${pathname}`);
  } catch (err) {
    const code = err instanceof EchotrailError ? err.code : 'E_INTERNAL';
    const status = err instanceof EchotrailError ? 400 : 500;
    if (!res.headersSent) sendError(res, status, code, (err as Error).message);
    else res.destroy();
  }
}
