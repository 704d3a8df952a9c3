/**
 * Worker thread of TracksCsvWorkerWriter (tracks-csv-thread.ts): formats the packed rows it is
 * sent with TracksCsvEncoder and writes them to the file in ~64 kB pieces, one message at a time,
 * waiting for the file to drain.
 */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { parentPort } from 'node:worker_threads';
import { workerInput } from '../worker-input.ts';
import { TracksCsvEncoder } from './tracks-csv.ts';
import { isTracksWorkerCommand, UPDATE_FIELDS, unpackUpdate, type TracksWorkerInput, type TracksWorkerMessage } from './tracks-packing.ts';
import type { Measurement, TrackUpdate } from '../types.ts';

const CHUNK_BYTES = 65536;

const port = parentPort!;
const { path, shownPath } = workerInput() as TracksWorkerInput;
const send = (m: TracksWorkerMessage) => port.postMessage(m);
const out = createWriteStream(path);
let failed = false;
const failure = new Promise<never>((_, reject) => out.once('error', reject));
failure.catch((e: Error) => {
  failed = true;
  send({ type: 'error', message: `cannot write ${shownPath}: ${e.message}` });
});
const enc = new TracksCsvEncoder(CHUNK_BYTES);
enc.header();
const row = { measurement: undefined } as TrackUpdate;
const meas = {} as Measurement;

async function handle(raw: unknown): Promise<void> {
  if (!isTracksWorkerCommand(raw)) throw new Error('the tracking thread sent an unreadable message');
  const m = raw;
  if (m.type === 'rows') {
    const end = m.count * UPDATE_FIELDS;
    for (let k = 0; k < end; k += UPDATE_FIELDS) {
      unpackUpdate(m.rows, k, row, meas);
      enc.add(row);
      if (enc.length >= CHUNK_BYTES && !out.write(enc.take())) await Promise.race([once(out, 'drain'), failure]);
    }
    send({ type: 'written' });
    return;
  }
  out.end(enc.take());
  await Promise.race([once(out, 'finish'), failure]);
  send({ type: 'done' });
}

// One message at a time, in order: a piece must be in the file before the next is formatted.
let chain = Promise.resolve();
port.on('message', (raw: unknown) => {
  chain = chain.then(() => (failed ? undefined : handle(raw))).catch((e: Error) => {
    if (!failed) send({ type: 'error', message: `cannot write ${shownPath}: ${e.message}` });
    failed = true;
  });
});
