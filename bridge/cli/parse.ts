/**
 * One way for every subcommand to parse its arguments with commander: usage errors exit 2,
 * `--help` exits 0, and nothing calls process.exit (so tests can run commands in-process).
 */
import { CommanderError, type Command } from 'commander';

/** Parses `argv` into `cmd`; returns the exit code to stop with, or null to carry on. */
export function parseOrExit(cmd: Command, argv: string[]): number | null {
  cmd.exitOverride().configureOutput({ writeErr: (s) => process.stderr.write(s) });
  try {
    cmd.parse(argv, { from: 'user' });
    return null;
  } catch (err) {
    if (err instanceof CommanderError) return err.exitCode === 0 ? 0 : 2;
    throw err;
  }
}
