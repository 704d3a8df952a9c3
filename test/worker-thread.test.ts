import { describe, expect, it } from 'vitest';
import { once } from 'node:events';
import { startWorker, workerFailure } from '../bridge/worker-thread.ts';

const echo = new URL('./helpers/echo-worker.ts', import.meta.url);

describe('startWorker', () => {
  it('runs a TypeScript module in a worker thread with the input it was given', async () => {
    const w = await startWorker(echo, { n: 21 });
    const [msg] = await once(w, 'message');
    expect(msg).toEqual({ doubled: 42 });
    await w.terminate();
  });

  it('starts several workers of one module at once, each with its own input', async () => {
    const ws = await Promise.all([1, 2, 3].map((n) => startWorker(echo, { n })));
    const answers = await Promise.all(ws.map(async (w) => (await once(w, 'message'))[0]));
    expect(answers).toEqual([{ doubled: 2 }, { doubled: 4 }, { doubled: 6 }]);
    await Promise.all(ws.map((w) => w.terminate()));
  });

  it('reports an exception in the worker as an error event, which workerFailure words for the user', async () => {
    const w = await startWorker(echo, { n: 1, fail: true });
    const [err] = await once(w, 'error');
    const e = workerFailure('the test thread', err);
    expect(e.message).toBe('the test thread stopped unexpectedly: asked to fail');
    expect(workerFailure('the test thread', 3).message).toBe('the test thread stopped unexpectedly: exit code 3');
  });
});
