/**
 * Worker thread of TracksCsvWorkerWriter (tracks-csv-thread.ts): writes the packed rows it is
 * sent to the file through the same sink `track` uses in one thread (tracks-csv-sink.ts), one
 * message at a time, waiting for the file to drain.
 */
import { createWriteStream } from 'node:fs';
import { parentPort } from 'node:worker_threads';
import { workerInput } from '../worker-input.ts';
import { tracksCsvSink } from './tracks-csv-sink.ts';
import { isTracksWorkerCommand, isTracksWorkerInput, UPDATE_FIELDS, unpackUpdate, type TracksWorkerMessage } from './tracks-packing.ts';
import type { Measurement, TrackUpdate } from '../types.ts';

const port = parentPort!;
const input = workerInput();
if (!isTracksWorkerInput(input)) throw new Error('the tracks writer thread was started without a file path');
const { path, shownPath } = input;
const send = (m: TracksWorkerMessage) => port.postMessage(m);
// Its write errors say `cannot write <shownPath>: …`, which goes back as the worker's error.
const sink = tracksCsvSink(createWriteStream(path), true, shownPath);
const row = { measurement: undefined } as TrackUpdate;
const meas = {} as Measurement;

async function handle(raw: unknown): Promise<void> {
  if (!isTracksWorkerCommand(raw)) throw new Error(`cannot write ${shownPath}: the tracking thread sent an unreadable message`);
  if (raw.type === 'rows') {
    const end = raw.count * UPDATE_FIELDS;
    for (let k = 0; k < end; k += UPDATE_FIELDS) {
      unpackUpdate(raw.rows, k, row, meas);
      sink.add(row);
    }
    await sink.room();
    send({ type: 'written' });
    return;
  }
  await sink.end();
  send({ type: 'done' });
}

// One message at a time, in order: a piece must be in the file before the next is formatted.
let failed = false;
let chain = Promise.resolve();
port.on('message', (raw: unknown) => {
  chain = chain.then(() => (failed ? undefined : handle(raw))).catch((e: Error) => {
    if (!failed) send({ type: 'error', message: e.message });
    failed = true;
  });
});
