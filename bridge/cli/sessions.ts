/**
 * `echotrail sessions`: lists recorded sessions as a table (or JSON with --json), newest first.
 * The folder is named `--sessions DIR` as in `echotrail start`, so one flag carries over between
 * recording and listing; `--dir` stays for the scripts that already use it.
 */
import { Command } from 'commander';
import { join, relative } from 'node:path';
import { findSession, listSessions } from '../session/list.ts';
import { REPO_ROOT } from '../server/web-build.ts';
import type { SessionInfo } from '../server/protocol.ts';

/**
 * "12.5 s", "1 min 20 s", "1 h 05 min": the way the dashboard's session picker says it. Whole
 * seconds are rounded before they are split, so 119.6 s is "2 min 00 s", never "1 min 60 s".
 */
export function duration(s: number): string {
  if (s < 59.95) return `${s.toFixed(1)} s`;
  const whole = Math.round(s);
  if (whole < 3600) return `${Math.floor(whole / 60)} min ${String(whole % 60).padStart(2, '0')} s`;
  const min = Math.round(s / 60);
  return `${Math.floor(min / 60)} h ${String(min % 60).padStart(2, '0')} min`;
}

/**
 * A plain text table: one header row, one row per session. `files` gives each session's file as
 * the user should type it (for `start --replay` and `compare --session`), by id.
 */
export function sessionsTable(sessions: SessionInfo[], files: ReadonlyMap<string, string> = new Map()): string {
  const head = ['id', 'start (UTC)', 'duration', 'detections', 'tracks', 'commanded', 'closed', ...(files.size ? ['file'] : [])];
  const rows = sessions.map((s) => [s.id, s.startUtc.replace('T', ' ').replace(/\.\d+Z$|Z$/, ''), duration(s.durationS), String(s.detections), String(s.tracks), s.hasCommanded ? 'yes' : 'no', s.closed === false ? 'no (cut off)' : 'yes', ...(files.size ? [files.get(s.id) ?? '?'] : [])]);
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const right = new Set([2, 3, 4]);
  const fmt = (r: string[]): string => r.map((c, i) => (right.has(i) ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join('  ').trimEnd();
  return [fmt(head), ...rows.map(fmt)].join('\n');
}

export async function run(argv: string[]): Promise<number> {
  const cmd = new Command('echotrail sessions')
    .description('List recorded sessions (newest first). "commanded" says whether the session holds a commanded path (cmd or positioner records); "closed" says whether it ends with its summary (no: cut off by a kill or a power loss, or still recording; it replays up to where it stops).')
    .option('--sessions <folder...>', 'session folders to list, as given to `start --sessions` (default: <repo>/sessions, where live runs are recorded)')
    .option('--dir <folder...>', 'the same as --sessions (older name)')
    .option('--demo', 'also list the demo sessions in replays/')
    .option('--json', 'print JSON instead of a table')
    .exitOverride();
  try {
    cmd.parse(argv, { from: 'user' });
  } catch (err) {
    return (err as { exitCode?: number }).exitCode === 0 ? 0 : 2;
  }
  const f = cmd.opts<{ sessions?: string[]; dir?: string[]; demo?: boolean; json?: boolean }>();
  const given = [...(f.sessions ?? []), ...(f.dir ?? [])];
  const dirs = [...(given.length ? given : [join(REPO_ROOT, 'sessions')]), ...(f.demo ? [join(REPO_ROOT, 'replays')] : [])];
  const sessions = await listSessions(dirs);
  if (f.json) process.stdout.write(JSON.stringify(sessions, null, 2) + '\n');
  else if (!sessions.length) process.stdout.write(`no sessions in ${dirs.join(', ')}\n`);
  else {
    const files = new Map<string, string>();
    for (const s of sessions) {
      const path = await findSession(dirs, s.id);
      if (path) files.set(s.id, relative(process.cwd(), path) || path);
    }
    process.stdout.write(sessionsTable(sessions, files) + '\n');
  }
  return 0;
}
