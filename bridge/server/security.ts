/**
 * Who may talk to the bridge. The bridge controls a lab's recording and replays, so:
 * - a browser page from another site must not open the WebSocket (the `Origin` header is checked);
 * - on a loopback bind, the `Host` header must name this machine, which defeats DNS rebinding;
 * - on any other bind a shared token is required (query `?token=` or header `x-echotrail-token`).
 * Non-browser clients (tests, scripts) send no Origin and are judged by the token alone.
 */
import type { IncomingMessage } from 'node:http';
import { timingSafeEqual } from 'node:crypto';
import { isLoopback } from './options.ts';

/** The parts of the bridge options that decide access. */
export interface AccessOptions {
  /** Bound address. */
  host: string;
  /** Token demanded when `requireToken`. */
  token: string | undefined;
  /** Whether the token is demanded. */
  requireToken: boolean;
  /** Extra accepted Origin values (exact, e.g. http://localhost:5173). */
  allowedOrigins: string[];
}

export type AccessVerdict = { ok: true } | { ok: false; status: 401 | 403; reason: string };

export const TOKEN_HEADER = 'x-echotrail-token';

function hostName(hostHeader: string): string {
  // "[::1]:8080" → "[::1]", "localhost:8080" → "localhost"
  if (hostHeader.startsWith('[')) return hostHeader.slice(0, hostHeader.indexOf(']') + 1);
  const colon = hostHeader.lastIndexOf(':');
  return colon >= 0 ? hostHeader.slice(0, colon) : hostHeader;
}

function sameToken(given: string, want: string): boolean {
  const a = Buffer.from(given);
  const b = Buffer.from(want);
  return a.length === b.length && timingSafeEqual(a, b);
}

/** The token a request carries, from the query or the header. */
export function requestToken(req: IncomingMessage): string | null {
  const header = req.headers[TOKEN_HEADER];
  if (typeof header === 'string' && header) return header;
  const q = new URL(req.url ?? '/', 'http://x').searchParams.get('token');
  return q || null;
}

/** Checks Host and the token: for the HTTP API and the WebSocket alike. */
export function checkAccess(req: IncomingMessage, o: AccessOptions): AccessVerdict {
  const host = req.headers.host ?? '';
  if (isLoopback(o.host) && !isLoopback(hostName(host).toLowerCase())) {
    return { ok: false, status: 403, reason: `Host '${host.slice(0, 100)}' is not this machine` };
  }
  if (o.requireToken) {
    const given = requestToken(req);
    if (!given || !o.token || !sameToken(given, o.token)) return { ok: false, status: 401, reason: 'missing or wrong token' };
  }
  return { ok: true };
}

/** Checks the Origin of a WebSocket upgrade: absent, the page's own host, or allow-listed. */
export function checkOrigin(req: IncomingMessage, o: AccessOptions): AccessVerdict {
  const origin = req.headers.origin;
  if (origin === undefined) return { ok: true };
  if (o.allowedOrigins.includes(origin)) return { ok: true };
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    return { ok: false, status: 403, reason: 'malformed Origin' };
  }
  if (originHost !== '' && originHost === (req.headers.host ?? '')) return { ok: true };
  return { ok: false, status: 403, reason: `Origin '${origin.slice(0, 100)}' is not allowed` };
}
