/**
 * Result files are written beside their final name and renamed into place only when the command
 * succeeded, so a failed run leaves the previous result as it was (a rename within one folder is
 * atomic on POSIX file systems). Writers stream into `tmp` as they would into the file itself.
 */
import { rmSync, statSync } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { EchotrailError } from './errors.ts';

export interface AtomicFile {
  /** The final path. */
  readonly path: string;
  /** Where to write meanwhile: same folder (so the rename cannot cross file systems), hidden name. */
  readonly tmp: string;
  /** Moves the temporary file onto the final path. */
  commit(): Promise<void>;
  /** Removes the temporary file, if any; never throws. */
  discard(): Promise<void>;
}

/**
 * A temporary file beside `path`, unique per process and call. Throws E_PATH at once when the
 * folder is missing: the write would fail anyway, and naming the hidden temporary file in that
 * message would only confuse.
 */
export function atomicFile(path: string): AtomicFile {
  const dir = dirname(path);
  if (!statSync(dir, { throwIfNoEntry: false })?.isDirectory()) throw new EchotrailError('E_PATH', `cannot write ${path}: the folder ${dir} does not exist`);
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${(counter++).toString(36)}.tmp`);
  return {
    path,
    tmp,
    async commit() {
      try {
        await rename(tmp, path);
      } catch (err) {
        throw new EchotrailError('E_PATH', `cannot write ${path}: ${(err as Error).message}`, { cause: err });
      }
    },
    async discard() {
      await rm(tmp, { force: true }).catch(() => undefined);
    },
  };
}
let counter = 0;

/**
 * Runs `body` with the temporary paths of `paths` ('-' passes through untouched), then renames
 * them all into place; on any failure the temporary files are removed and the old files stay.
 */
export async function writeAtomically<T>(paths: readonly string[], body: (tmp: string[]) => Promise<T>): Promise<T> {
  const files = paths.map((p) => (p === '-' ? null : atomicFile(p)));
  const stopCleanup = removeOnSignal(files.flatMap((f) => (f ? [f.tmp] : [])));
  try {
    const result = await body(files.map((f, i) => f?.tmp ?? paths[i]));
    for (const f of files) await f?.commit();
    return result;
  } catch (err) {
    await Promise.all(files.map((f) => f?.discard()));
    throw err;
  } finally {
    stopCleanup();
  }
}

/** Exit codes of a process ended by a signal, as a shell reports them (128 + its number). */
const SIGNAL_EXIT: Partial<Record<NodeJS.Signals, number>> = { SIGINT: 130, SIGTERM: 143, SIGHUP: 129 };

/**
 * Until the returned function is called, Ctrl-C (SIGINT), SIGTERM or SIGHUP removes `tmps` and
 * ends the process with the signal's usual exit code: an interrupted run must leave the previous
 * result and nothing else. (`kill -9` cannot be caught: its hidden temporary file, named after
 * the process, stays beside the result.)
 */
function removeOnSignal(tmps: readonly string[]): () => void {
  if (tmps.length === 0) return () => undefined;
  const handlers = (Object.keys(SIGNAL_EXIT) as NodeJS.Signals[]).map((signal) => {
    const handler = () => {
      for (const t of tmps) rmSync(t, { force: true });
      process.exit(SIGNAL_EXIT[signal]);
    };
    process.once(signal, handler);
    return [signal, handler] as const;
  });
  return () => {
    for (const [signal, handler] of handlers) process.off(signal, handler);
  };
}
