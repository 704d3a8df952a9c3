/**
 * Inside a worker started by startWorker (worker-thread.ts): the input it was given. Its own
 * module so that worker code does not load the starter (and esbuild with it).
 */
import { workerData } from 'node:worker_threads';

export function workerInput(): unknown {
  return workerData as unknown;
}
