/**
 * Worker thread of readDetectionsCsvInWorker (detections-csv-thread.ts): runs readDetectionsCsv
 * on the file and posts its batches, packed, at most `window` ahead of what the consumer took.
 */
import { parentPort } from 'node:worker_threads';
import { workerInput } from '../worker-input.ts';
import { readDetectionsCsv } from './detections-csv.ts';
import { isDetectionsWorkerInput, isMoreMessage, packDetections, plainReport, type DetectionsWorkerMessage } from './detections-packing.ts';
import { EchotrailError } from '../errors.ts';

async function main(): Promise<void> {
  const port = parentPort!;
  const input = workerInput();
  if (!isDetectionsWorkerInput(input)) throw new Error('the detections reader thread was started without a readable file path, options and window');
  const { path, options, window } = input;
  let credit = window;
  let wake: (() => void) | null = null;
  port.on('message', (m: unknown) => {
    if (!isMoreMessage(m)) return;
    credit++;
    wake?.();
  });
  const send = (m: DetectionsWorkerMessage, transfer: ArrayBuffer[] = []) => port.postMessage(m, transfer);
  const reader = readDetectionsCsv(path, options);
  try {
    for await (const batch of reader.batches()) {
      while (credit === 0) await new Promise<void>((r) => (wake = r));
      credit--;
      const rows = packDetections(batch);
      send({ type: 'batch', rows, report: plainReport(reader.report) }, [rows.buffer]);
    }
    send({ type: 'end', report: plainReport(reader.report) });
  } catch (err) {
    send({ type: 'error', code: err instanceof EchotrailError ? err.code : null, message: err instanceof Error ? err.message : String(err) });
  }
  // The worker stays until the consumer ends it (its port still listens): nothing is lost in flight.
}

void main();
