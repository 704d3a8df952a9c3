/**
 * Command-line entry: `echotrail <subcommand> [options]`.
 *
 * One file per subcommand in this folder, each exporting `run(argv): Promise<number>` (the exit
 * code). This file only dispatches, so a subcommand's start-up cost is paid only when it runs.
 * It first moves to the user's directory (user-dir.ts): run through npm, the process starts in the
 * repository, and relative paths (and defaults such as calibration.json) must mean the user's.
 */
import { errorLine } from './report-error.ts';
import { userDir } from './user-dir.ts';
import { EchotrailError } from '../errors.ts';
const SUBCOMMANDS: Record<string, { summary: string; load: () => Promise<{ run(argv: string[]): Promise<number> }> }> = {
  start: { summary: 'serve the dashboard and stream a demo replay, a session or a serial port', load: () => import('./start.ts') },
  track: { summary: 'track a detections CSV into a tracks CSV (headless)', load: () => import('./track.ts') },
  simulate: { summary: 'simulate a bench run: detections, truth and commanded-path CSVs', load: () => import('./simulate.ts') },
  compare: { summary: 'compare a tracked path with the commanded path; JSON, CSV and HTML report', load: () => import('./compare.ts') },
  calibrate: { summary: 'fit range/azimuth offsets or the positioner frame from recorded runs', load: () => import('./calibrate.ts') },
  tune: { summary: 'estimate noise and process-noise settings from a recorded run into a tracker profile', load: () => import('./tune.ts') },
  sessions: { summary: 'list recorded sessions', load: () => import('./sessions.ts') },
  feed: { summary: 'play a simulated bench run into a serial port in the line protocol (no radar needed)', load: () => import('./feed.ts') },
  demo: { summary: 'rebuild the demo sessions in replays/ from the bench simulator', load: () => import('./demo.ts') },
};

function usage(): string {
  const lines = ['usage: echotrail <command> [options]   (echotrail <command> --help for its options)', '', 'commands:'];
  for (const [name, { summary }] of Object.entries(SUBCOMMANDS)) lines.push(`  ${name.padEnd(10)} ${summary}`);
  return lines.join('\n');
}

async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h') {
    process.stdout.write(usage() + '\n');
    return name ? 0 : 2;
  }
  const entry = SUBCOMMANDS[name];
  if (!entry) {
    process.stderr.write(`echotrail: unknown command '${name}'\n${usage()}\n`);
    return 2;
  }
  const mod = await entry.load();
  return mod.run(rest);
}

const here = userDir();
if (here !== process.cwd()) process.chdir(here);

// Output piped into `head` (or any reader that stops early) closes stdout under us: that is the
// reader's choice, not a failure, so stop quietly instead of dying on an unhandled EPIPE.
process.stdout.on('error', (e: NodeJS.ErrnoException) => {
  if (e.code !== 'EPIPE') throw e;
  process.exit(0);
});

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    const name = process.argv[2] ?? '';
    process.stderr.write(err instanceof EchotrailError ? `${errorLine(name, err)}\n` : `echotrail ${name}: ${err instanceof Error ? err.message : String(err)}\n`);
    process.exitCode = 1;
  },
);
