/**
 * The session list for the dashboard. Cheap on the common path: the header line and the `end`
 * summary a clean close writes at the tail. A session without one (killed, or still being
 * recorded) is scanned once, and later calls read on only from where the last one stopped, so
 * listing while a long run records stays cheap; the scan yields to the event loop every
 * SCAN_YIELD_LINES lines. Results are cached while size and mtime stay.
 */
import { closeSync, openSync, readSync } from 'node:fs';
import { readdir, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { SessionInfo } from '../server/protocol.ts';
import { SESSION_SUFFIX, sessionHeader, sessionLine } from './format.ts';
import { parseSessionLine, sessionIdOf } from './reader.ts';
import { LineReader } from './line-reader.ts';

const TAIL_BYTES = 64 * 1024;
const cache = new Map<string, { key: string; info: SessionInfo }>();

/** The first line (with its byte length) and the last complete line (within 64 KiB of the end). */
function headAndLastLine(path: string, size: number): { head: string; headBytes: number; last: string } {
  const fd = openSync(path, 'r');
  try {
    const first = new LineReader(fd, { chunkBytes: 16 * 1024 }).lines(0, 1).next();
    if (first.done) return { head: '', headBytes: 0, last: '' };
    const tailLen = Math.min(size, TAIL_BYTES);
    const tail = Buffer.alloc(tailLen);
    readSync(fd, tail, 0, tailLen, size - tailLen);
    const text = tail.toString('utf8');
    const end = text.lastIndexOf('\n');
    const start = text.lastIndexOf('\n', end - 1);
    return { head: first.value.text, headBytes: first.value.bytes, last: end > 0 ? text.slice(start + 1, end) : '' };
  } finally {
    closeSync(fd);
  }
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

/** Counts of a session without summary, as far as it has been read, so a growing file is read on from there. */
interface Scan {
  head: string;
  offset: number;
  line: number;
  durationS: number;
  detections: number;
  trackIds: Set<number>;
  hasCommanded: boolean;
}
const scans = new Map<string, Scan>();

/**
 * Lines parsed between two turns of the event loop: a 150 MB session killed before its summary
 * is ~750k lines, and serial input and WebSocket traffic must not wait for all of them.
 */
export const SCAN_YIELD_LINES = 10_000;
/** Scans in flight, so two listings of the same file wait for one scan instead of interleaving. */
const scanning = new Map<string, Promise<Scan>>();

/** Reads the lines added since the last scan of `path` (all of them the first time), yielding as it goes. */
function scanOn(path: string, head: string, headBytes: number): Promise<Scan> {
  const prev = scanning.get(path) ?? Promise.resolve(null);
  const next = prev.catch(() => null).then(() => scanFrom(path, head, headBytes));
  scanning.set(path, next);
  const done = (): void => {
    if (scanning.get(path) === next) scanning.delete(path);
  };
  next.then(done, done);
  return next;
}

async function scanFrom(path: string, head: string, headBytes: number): Promise<Scan> {
  let sc = scans.get(path);
  if (!sc || sc.head !== head) {
    sc = { head, offset: headBytes, line: 2, durationS: 0, detections: 0, trackIds: new Set(), hasCommanded: false };
    scans.set(path, sc);
  }
  const fd = openSync(path, 'r');
  try {
    let n = 0;
    for (const raw of new LineReader(fd).lines(sc.offset, sc.line)) {
      sc.offset = raw.offset + raw.bytes + 1;
      sc.line = raw.line + 1;
      const r = parseSessionLine(raw);
      if (typeof r !== 'string') {
        sc.durationS = Math.max(sc.durationS, r.timeS);
        if ('end' in r) {
          /* counted in durationS only */
        } else if (r.record.kind === 'detection') sc.detections++;
        else if (r.record.kind === 'track') sc.trackIds.add(r.record.update.id);
        else if (r.record.kind === 'commanded' || r.record.kind === 'positioner') sc.hasCommanded = true;
      }
      // The counts so far are kept in `sc`, so the scan resumes correctly whoever runs next.
      if (++n % SCAN_YIELD_LINES === 0) await new Promise((res) => setImmediate(res));
    }
  } finally {
    closeSync(fd);
  }
  return sc;
}

/** Summary of one session file, or null when it is not a readable session. */
export async function sessionInfo(path: string): Promise<SessionInfo | null> {
  let st;
  try {
    st = await stat(path);
  } catch {
    return null;
  }
  const key = `${st.size}:${st.mtimeMs}`;
  const hit = cache.get(path);
  if (hit && hit.key === key) return hit.info;
  let info: SessionInfo;
  try {
    const { head, headBytes, last } = headAndLastLine(path, st.size);
    const h = sessionHeader.safeParse(parseJson(head));
    if (!h.success) return null;
    const end = sessionLine.safeParse(parseJson(last));
    const base = { id: sessionIdOf(path), name: h.data.name, startUtc: h.data.startUtc };
    if (end.success && end.data.k === 'end') {
      const s = end.data.summary;
      info = { ...base, durationS: end.data.timeS, detections: s.detections, tracks: s.tracks, hasCommanded: s.hasCommanded, closed: true };
      scans.delete(path);
    } else {
      // No summary (kill -9, or still recording): count the lines, continuing where the last call stopped.
      const sc = await scanOn(path, head, headBytes + 1);
      info = { ...base, durationS: sc.durationS, detections: sc.detections, tracks: sc.trackIds.size, hasCommanded: sc.hasCommanded, closed: false };
    }
  } catch {
    return null;
  }
  cache.set(path, { key, info });
  return info;
}

/** Session files (`*.session.jsonl`) directly inside `dirs`; missing folders are skipped. */
async function sessionFiles(dirs: string[]): Promise<string[]> {
  const out: string[] = [];
  for (const dir of dirs) {
    let names: string[];
    try {
      names = await readdir(dir);
    } catch {
      continue;
    }
    for (const n of names) if (n.endsWith(SESSION_SUFFIX)) out.push(join(dir, n));
  }
  return out;
}

/** Every readable session in `dirs`, newest first. Unreadable files are left out, not fatal. */
export async function listSessions(dirs: string | string[]): Promise<SessionInfo[]> {
  const infos: SessionInfo[] = [];
  const seen = new Set<string>();
  for (const path of await sessionFiles(Array.isArray(dirs) ? dirs : [dirs])) {
    const info = await sessionInfo(path);
    // The first folder wins when two hold the same id, as findSession() resolves it.
    if (info && !seen.has(info.id)) {
      seen.add(info.id);
      infos.push(info);
    }
  }
  return infos.sort((a, b) => (a.startUtc < b.startUtc ? 1 : a.startUtc > b.startUtc ? -1 : a.id.localeCompare(b.id)));
}

/** Path of session `id` in the first of `dirs` that holds it; null for unknown or unsafe ids. */
export async function findSession(dirs: string | string[], id: string): Promise<string | null> {
  if (!/^[A-Za-z0-9._-]{1,200}$/.test(id) || id.startsWith('.')) return null;
  for (const dir of Array.isArray(dirs) ? dirs : [dirs]) {
    const path = join(dir, id + SESSION_SUFFIX);
    try {
      if ((await stat(path)).isFile()) return path;
    } catch {
      /* not in this folder */
    }
  }
  return null;
}
