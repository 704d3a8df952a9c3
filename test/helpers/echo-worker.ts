/** A worker for test/worker-thread.test.ts: echoes its input doubled, or throws when asked to. */
import { parentPort } from 'node:worker_threads';
import { workerInput } from '../../bridge/worker-input.ts';

const input = workerInput() as { n: number; fail?: boolean };
if (input.fail) throw new Error('asked to fail');
const doubled: number = input.n * 2;
parentPort!.postMessage({ doubled });
