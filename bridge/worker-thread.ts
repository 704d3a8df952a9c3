/**
 * Worker threads for the file stages of `track` (reading detections, writing tracks).
 *
 * A worker cannot load this project's TypeScript by itself: the tsx loader that the main thread
 * runs under is not inherited, and registering it in the worker costs about a quarter of a second
 * of start-up (its hooks thread, then every module loaded through it), as long as reading a
 * 150k-row file takes. So the worker's module is bundled in memory with esbuild (the
 * transformer tsx itself uses), once per process per module, about 20 ms, and the worker starts
 * from that code: about 80 ms to its first message.
 */
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { build } from 'esbuild';

const bundles = new Map<string, Promise<string>>();

/** The module at `entry` and everything it imports, as one CommonJS script. */
function bundle(entry: URL): Promise<string> {
  let code = bundles.get(entry.href);
  if (!code) {
    code = build({ entryPoints: [fileURLToPath(entry)], bundle: true, platform: 'node', format: 'cjs', target: 'node20', write: false, logLevel: 'silent' }).then((r) => r.outputFiles[0].text);
    bundles.set(entry.href, code);
    // A failed build is not kept: the next call tries again.
    code.catch(() => bundles.delete(entry.href));
  }
  return code;
}

/** Starts the TypeScript module `entry` in a worker thread; it reads `data` with workerInput() (worker-input.ts). */
export async function startWorker(entry: URL, data: unknown): Promise<Worker> {
  // stdout/stderr stay the parent's: a worker of these commands writes only files.
  return new Worker(await bundle(entry), { eval: true, workerData: data });
}

/**
 * An error for a worker that stopped without saying why (an uncaught exception in it, or an exit
 * before its last message): `what` names the stage, for the user.
 */
export function workerFailure(what: string, cause: unknown): Error {
  const detail = cause instanceof Error ? cause.message : `exit code ${String(cause)}`;
  return new Error(`${what} stopped unexpectedly: ${detail}`, { cause });
}
