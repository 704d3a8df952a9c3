/**
 * Session benchmark: recording rate, index build on a one-hour session, and seek (snapshotAt)
 * through the seek index against the baseline of the same reader with no index (one checkpoint
 * at 0, so every snapshot reads from the start of the file), measured in the same run.
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openSession } from '../bridge/session/reader.ts';
import { writeSyntheticSession } from '../test/session/synthetic-session.ts';

const dir = mkdtempSync(join(tmpdir(), 'echotrail-bench-'));
const ms = (t0: bigint) => Number(process.hrtime.bigint() - t0) / 1e6;
const quantile = (xs: number[], q: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(q * xs.length))];

/** One hour at `perScan` detections per 0.1 s scan, plus the tracks' updates. */
async function run(perScan: number): Promise<void> {
  console.log(`\n-- one hour, ${perScan * 10} detections/s --`);
  let t0 = process.hrtime.bigint();
  const syn = writeSyntheticSession(dir, 3600, `bench-${perScan}`, perScan);
  const writeMs = ms(t0);
  const size = statSync(syn.path).size;
  console.log(`record: ${syn.written.length} records, ${(size / 1e6).toFixed(1)} MB in ${writeMs.toFixed(0)} ms (${((syn.written.length / writeMs) * 1000).toFixed(0)} records/s, one write(2) each)`);

  t0 = process.hrtime.bigint();
  const indexed = await openSession(syn.path);
  const openMs = ms(t0);
  console.log(`open + validate + index (one hour): ${openMs.toFixed(0)} ms, ${indexed.index.checkpoints.length} checkpoints`);

  let seed = 42;
  const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32);
  const times = Array.from({ length: 200 }, () => rand() * 3600);
  const seek: number[] = [];
  for (const t of times) {
    t0 = process.hrtime.bigint();
    indexed.snapshotAt(t);
    seek.push(ms(t0));
  }
  console.log(`seek with index: p50 ${quantile(seek, 0.5).toFixed(2)} ms, p99 ${quantile(seek, 0.99).toFixed(2)} ms, max ${Math.max(...seek).toFixed(2)} ms over ${seek.length} seeks`);

  const plain = await openSession(syn.path, { checkpointS: 1e9 });
  const base: number[] = [];
  for (const t of times.slice(0, 10)) {
    t0 = process.hrtime.bigint();
    plain.snapshotAt(t);
    base.push(ms(t0));
  }
  const b50 = quantile(base, 0.5);
  console.log(`baseline (no index, read from start): p50 ${b50.toFixed(1)} ms over ${base.length} seeks`);
  console.log(`ratio baseline / indexed (p50): ${(b50 / quantile(seek, 0.5)).toFixed(0)}×`);
  indexed.close();
  plain.close();
  rmSync(syn.path);
}

try {
  await run(2);
  await run(30);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
