/**
 * One shape for every subcommand's failure on stderr: `echotrail <command>: E_CODE: message`, one
 * line, so scripts and people read every command's errors alike (codes: bridge/errors.ts).
 */
import { EchotrailError } from '../errors.ts';

/** The line written for an error (without the newline). */
export function errorLine(command: string, err: EchotrailError): string {
  return `echotrail ${command}: ${err.code}: ${err.message}`;
}

/**
 * Writes an EchotrailError and returns the exit code: `optionExit` for E_OPTION (each command
 * keeps the exit code its callers rely on: 2 where option values are checked while parsing, 1 where
 * they are checked while running), 1 for anything else. Other errors are rethrown: they are bugs,
 * and their stack trace is wanted.
 */
export function reportError(command: string, err: unknown, optionExit: 1 | 2 = 1): number {
  if (!(err instanceof EchotrailError)) throw err;
  process.stderr.write(errorLine(command, err) + '\n');
  return err.code === 'E_OPTION' ? optionExit : 1;
}
