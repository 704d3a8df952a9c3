/**
 * `echotrail sessions`: lists recorded sessions as a table (or JSON with --json), newest first.
 * The folder is named `--sessions DIR` as in `echotrail start`, so one flag carries over between
 * recording and listing; `--dir` stays for the scripts that already use it.
 */
import { Command } from 'commander';
import { join } from 'node:path';
import { listSessions } from '../session/list.ts';
import { REPO_ROOT } from '../server/web-build.ts';
import type { SessionInfo } from '../server/protocol.ts';

function duration(s: number): string {
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const sec = Math.round(s % 60);
  return h ? `${h}h${String(m).padStart(2, '0')}m` : m ? `${m}m${String(sec).padStart(2, '0')}s` : `${s.toFixed(1)}s`;
}

/** A plain text table: one header row, one row per session. */
export function sessionsTable(sessions: SessionInfo[]): string {
  const head = ['id', 'start (UTC)', 'duration', 'detections', 'tracks', 'commanded', 'closed'];
  const rows = sessions.map((s) => [s.id, s.startUtc.replace('T', ' ').replace(/\.\d+Z$|Z$/, ''), duration(s.durationS), String(s.detections), String(s.tracks), s.hasCommanded ? 'yes' : 'no', s.closed === false ? 'no (cut off)' : 'yes']);
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
  else process.stdout.write(sessionsTable(sessions) + '\n');
  return 0;
}
