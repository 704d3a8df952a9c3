import { describe, expect, it } from 'vitest';
import type { IncomingMessage } from 'node:http';
import { checkAccess, checkOrigin, type AccessOptions } from '../../bridge/server/security.ts';
import { safeJoin } from '../../bridge/server/static.ts';
import { isLoopback, resolveBridgeOptions } from '../../bridge/server/options.ts';
import { hasCode } from '../../bridge/errors.ts';

const req = (url: string, headers: Record<string, string>): IncomingMessage => ({ url, headers }) as unknown as IncomingMessage;
const loop: AccessOptions = { host: '127.0.0.1', token: undefined, requireToken: false, allowedOrigins: [] };

describe('access checks', () => {
  it('accepts loopback Host names and refuses others on a loopback bind', () => {
    for (const host of ['127.0.0.1:8080', 'localhost:8080', '[::1]:8080', 'LOCALHOST']) expect(checkAccess(req('/ws', { host }), loop).ok).toBe(true);
    for (const host of ['evil.example:8080', '10.0.0.5:8080', '']) expect(checkAccess(req('/ws', { host }), loop)).toMatchObject({ ok: false, status: 403 });
  });

  it('on a wide bind accepts any Host but demands the token', () => {
    const wide: AccessOptions = { host: '0.0.0.0', token: 'sekrit-token', requireToken: true, allowedOrigins: [] };
    expect(checkAccess(req('/ws', { host: 'bench-pc:8080' }), wide)).toMatchObject({ ok: false, status: 401 });
    expect(checkAccess(req('/ws?token=sekrit-token', { host: 'bench-pc:8080' }), wide).ok).toBe(true);
    expect(checkAccess(req('/ws', { host: 'bench-pc:8080', 'x-echotrail-token': 'sekrit-token' }), wide).ok).toBe(true);
    expect(checkAccess(req('/ws?token=sekrit-tokeN', { host: 'bench-pc:8080' }), wide).ok).toBe(false);
  });

  it('checks Origin against the Host header and the allow-list', () => {
    const o = { ...loop, allowedOrigins: ['http://localhost:5173'] };
    expect(checkOrigin(req('/ws', { host: '127.0.0.1:8080' }), o).ok).toBe(true);
    expect(checkOrigin(req('/ws', { host: '127.0.0.1:8080', origin: 'http://127.0.0.1:8080' }), o).ok).toBe(true);
    expect(checkOrigin(req('/ws', { host: '127.0.0.1:8080', origin: 'http://localhost:5173' }), o).ok).toBe(true);
    expect(checkOrigin(req('/ws', { host: '127.0.0.1:8080', origin: 'http://127.0.0.1:9999' }), o).ok).toBe(false);
    expect(checkOrigin(req('/ws', { host: '127.0.0.1:8080', origin: 'null' }), o).ok).toBe(false);
  });
});

describe('static paths', () => {
  it('never leaves the static folder', () => {
    expect(safeJoin('/srv/dist', '/index.html')).toBe('/srv/dist/index.html');
    expect(safeJoin('/srv/dist', '/assets/a.js')).toBe('/srv/dist/assets/a.js');
    expect(safeJoin('/srv/dist', '/../etc/passwd')).toBeNull();
    expect(safeJoin('/srv/dist', '/%2e%2e/%2e%2e/etc/passwd')).toBeNull();
    expect(safeJoin('/srv/dist', '/a%00b')).toBeNull();
    expect(safeJoin('/srv/dist', '/%E0%A4%A')).toBeNull();
    expect(safeJoin('/srv/dist', '/../dist-other/x')).toBeNull();
  });
});

describe('resolveBridgeOptions', () => {
  it('fills defaults: loopback, port 8080, no token required there, token required elsewhere', () => {
    const o = resolveBridgeOptions();
    expect(o).toMatchObject({ host: '127.0.0.1', port: 8080, requireToken: false, speed: 1, loop: false, maxPayloadBytes: 4096, record: false });
    expect(resolveBridgeOptions({ host: '0.0.0.0' }).requireToken).toBe(true);
    expect(resolveBridgeOptions({ serial: { path: '/dev/x', baudRate: 9600 } }).record).toBe(true);
    expect(isLoopback('127.1.2.3')).toBe(true);
    expect(isLoopback('192.168.1.2')).toBe(false);
  });

  it('refuses impossible values with E_OPTION naming the field', () => {
    for (const [bad, field] of [[{ port: 70000 }, 'port'], [{ speed: 80 }, 'speed'], [{ token: 'short' }, 'token'], [{ serial: { path: '', baudRate: 9600 } }, 'serial.path']] as const) {
      let err: unknown;
      try {
        resolveBridgeOptions(bad);
      } catch (e) {
        err = e;
      }
      expect(hasCode(err, 'E_OPTION')).toBe(true);
      expect((err as Error).message).toContain(field);
    }
  });
});
