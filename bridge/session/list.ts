/**
 * The session list for the dashboard. Cheap on the common path: the header line and the `end`
 * summary a clean close writes at the tail. A session without one (killed, or still being
 * recorded) is scanned in full once; the result is cached while the file's size and mtime stay.
 */
import { closeSync, openSync, readSync } from 'node:fs';
import { readdir, stat } from 'node:fs/promises';
import { join } from 'node:path';
import type { SessionInfo } from '../server/protocol.ts';
import { SESSION_SUFFIX, sessionHeader, sessionLine } from './format.ts';
import { openSession, sessionIdOf } from './reader.ts';

const TAIL_BYTES = 64 * 1024;
const cache = new Map<string, { key: string; info: SessionInfo }>();

/** The first line and the last complete line of a file (each within 64 KiB of its end). */
function headAndLastLine(path: string, size: number): { head: string; last: string } {
  const fd = openSync(path, 'r');
  try {
    const head = Buffer.alloc(Math.min(size, TAIL_BYTES));
    readSync(fd, head, 0, head.length, 0);
    const tailLen = Math.min(size, TAIL_BYTES);
    const tail = Buffer.alloc(tailLen);
    readSync(fd, tail, 0, tailLen, size - tailLen);
    const text = tail.toString('utf8');
    const end = text.lastIndexOf('\n');
    const start = text.lastIndexOf('\n', end - 1);
    return { head: head.toString('utf8').split('\n', 1)[0], last: end > 0 ? text.slice(start + 1, end) : '' };
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
  let info: SessionInfo | null = null;
  try {
    const { head, last } = headAndLastLine(path, st.size);
    const h = sessionHeader.safeParse(parseJson(head));
    if (!h.success) return null;
    const end = sessionLine.safeParse(parseJson(last));
    const id = sessionIdOf(path);
    if (end.success && end.data.k === 'end') {
      const s = end.data.summary;
      info = { id, name: h.data.name, startUtc: h.data.startUtc, durationS: end.data.timeS, detections: s.detections, tracks: s.tracks, hasCommanded: s.hasCommanded };
    } else {
      // No summary (kill -9, or still recording): count by reading every line.
      const r = await openSession(path);
      info = { id, name: r.header.name, startUtc: r.header.startUtc, durationS: r.durationS, detections: r.detections, tracks: r.trackIds.size, hasCommanded: r.hasCommanded };
      r.close();
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
