/**
 * Serves the built dashboard (web/dist) read-only: GET/HEAD, no directory listings, nothing outside
 * the folder. Hashed assets are cached for long; index.html never, so a rebuild shows at once.
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { extname, join, normalize, sep } from 'node:path';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.wasm': 'application/wasm',
  '.map': 'application/json; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
};

const MISSING_PAGE = `<!doctype html><meta charset="utf-8"><title>echotrail</title>
<p>The dashboard is not built. Run <code>npm run build:web</code> (or <code>npm start</code>, which builds it) and reload.</p>`;

function plain(res: ServerResponse, status: number, text: string): void {
  res.writeHead(status, { 'content-type': 'text/plain; charset=utf-8', 'content-length': Buffer.byteLength(text) });
  res.end(text);
}

/** Resolves a URL path inside `root`, or null when it would leave it. */
export function safeJoin(root: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0')) return null;
  const full = normalize(join(root, decoded));
  return full === root || full.startsWith(root.endsWith(sep) ? root : root + sep) ? full : null;
}

export async function serveStatic(root: string, req: IncomingMessage, res: ServerResponse, pathname: string): Promise<void> {
  if (req.method !== 'GET' && req.method !== 'HEAD') return plain(res, 405, 'method not allowed');
  let file = safeJoin(root, pathname === '/' ? '/index.html' : pathname);
  if (!file) return plain(res, 400, 'bad path');
  let info = await stat(file).catch(() => null);
  if (info?.isDirectory()) {
    file = join(file, 'index.html');
    info = await stat(file).catch(() => null);
  }
  if (!info || !info.isFile()) {
    if (pathname === '/' || pathname === '/index.html') {
      res.writeHead(200, { 'content-type': 'text/html; charset=utf-8', 'cache-control': 'no-cache' });
      res.end(MISSING_PAGE);
      return;
    }
    return plain(res, 404, 'not found');
  }
  const hashed = /[-.][A-Za-z0-9_]{8,}\.(js|css|woff2|png|svg)$/.test(file);
  res.writeHead(200, {
    'content-type': TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream',
    'content-length': info.size,
    'cache-control': hashed ? 'public, max-age=31536000, immutable' : 'no-cache',
    'x-content-type-options': 'nosniff',
  });
  if (req.method === 'HEAD') return void res.end();
  createReadStream(file)
    .on('error', () => res.destroy())
    .pipe(res);
}
