/**
 * `track` end to end: detections CSV file in → tracks CSV file out, on a 100-target and an
 * 800-target file, and the two file stages alone, each with a baseline measured in the same run.
 *
 * - reading: rows/s of `readDetectionsCsv` (csv-parse plus the reader's validation, line numbers
 *   and time-order check) against csv-parse with its default options only counting records, and
 *   against a bare `readline` loop splitting each line on commas (the floor of reading lines in
 *   Node at all);
 * - writing: rows/s of the tracks CSV writer `track` uses, on the updates the tracker produced
 *   for the same file, against a naive writer (`toFixed` per cell, one `write()` per row) and
 *   against writing the already-formatted bytes in 64 kB pieces (the file system's floor);
 * - end to end: detections/s of the command's own code path (`run()` of bridge/cli/track.ts,
 *   in-process, so Node and tsx start-up are not counted; files this size are read and written in
 *   worker threads), against the same run with `--io-threads never` (everything in one thread),
 *   and against the Tracker alone on the same detections in memory with the same options: the
 *   last ratio is what file I/O still costs on top of tracking. One spawned `node --import tsx bridge/cli/main.ts track` per file is also timed,
 *   start-up included, for scale.
 *
 * Each figure is the best of a few runs after a warm-up, per second of wall time and, in
 * brackets, per second of CPU time; a ratio ×r says how many times faster the project's code went
 * than the baseline on the same work (r < 1: slower).
 *
 * After both files: the growth of the end-to-end cost per detection from 100 to 800 targets, and
 * `track` against the `kalman-filter` baseline tracker (kalman-baseline.ts) end to end on the
 * same files (their first 40,000 and 20,000 detections: the baseline is quadratic).
 *
 * The load is bench/crowded-load.ts (shared with bench/track.bench.ts: same seeds and sizes),
 * written to a temporary directory by the project's detections writer.
 *
 * Run: npm run bench -- track-cli   (two to three minutes on a 2-core machine)
 */
import { spawnSync } from 'node:child_process';
import { createReadStream, createWriteStream, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { once } from 'node:events';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { parse } from 'csv-parse';
import { run as trackCommand } from '../bridge/cli/track.ts';
import { readDetectionsCsv, writeDetectionsCsv } from '../bridge/ingest/detections-csv.ts';
import { Tracker } from '../bridge/tracking/tracker.ts';
import { crowdedLoad } from './crowded-load.ts';
import { kalmanBaseline } from './kalman-baseline.ts';
import { TRACKS_CSV_HEADER, TracksCsvEncoder } from '../bridge/tracking/tracks-csv.ts';
import { tracksCsvSink } from '../bridge/tracking/tracks-csv-sink.ts';
import type { Detection, TrackUpdate } from '../bridge/types.ts';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');

interface Timing {
  ms: number;
  cpuMs: number;
  count: number;
}

/** The noise of the load, given as a calibrated profile would (as bench/track.bench.ts does). */
const NOISE_ARGS = ['--sigma-range', '0.05', '--sigma-azimuth', '0.1'];
const trackerFor = () => new Tracker({ revolutionBatches: true, measurement: { sigmaRangeM: 0.05, sigmaAzimuthRad: (0.1 * Math.PI) / 180 } });

/**
 * Best of `reps` runs after one warm-up run: wall time, and CPU time of all the process's threads
 * (file I/O and GC included), which moves less when other work shares the machine; ms. `f`
 * returns a count, checked to be the same on every run.
 */
async function best(reps: number, f: () => Promise<number> | number): Promise<Timing> {
  let ms = Infinity;
  let cpuMs = Infinity;
  let count = -1;
  for (let r = 0; r <= reps; r++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    const c = await f();
    const dt = performance.now() - t0;
    const cpu = process.cpuUsage(c0);
    if (r > 0) {
      ms = Math.min(ms, dt);
      cpuMs = Math.min(cpuMs, (cpu.user + cpu.system) / 1000);
    }
    if (count >= 0 && c !== count) throw new Error(`run ${r} counted ${c}, earlier runs ${count}`);
    count = c;
  }
  return { ms, cpuMs, count };
}

async function readProject(path: string): Promise<number> {
  let n = 0;
  for await (const b of readDetectionsCsv(path).batches()) n += b.length;
  return n;
}

async function readCsvParseDefault(path: string): Promise<number> {
  let n = -1; // the header is a record too
  const parser = createReadStream(path).pipe(parse());
  for await (const _ of parser) n++;
  return n;
}

async function readReadlineSplit(path: string): Promise<number> {
  let n = -1;
  let cells = 0;
  for await (const line of createInterface({ input: createReadStream(path), crlfDelay: Infinity })) {
    cells += line.split(',').length;
    n++;
  }
  if (cells < n) throw new Error('unreachable: keeps the split from being optimised away');
  return n;
}

/** The writer `track` uses in one thread (bridge/tracking/tracks-csv-sink.ts): rows encoded into ~64 kB pieces, back-pressured. */
async function writeProject(updates: TrackUpdate[], path: string): Promise<number> {
  const sink = tracksCsvSink(createWriteStream(path), true, path);
  // `track` asks for room once per batch the reader hands over (about 2,000 rows).
  for (let i = 0; i < updates.length; i++) {
    sink.add(updates[i]);
    if (i % 2048 === 2047) await sink.room();
  }
  await sink.end();
  return updates.length;
}

/** Naive: every cell through toFixed (or as is), joined, one write() per row. */
async function writeNaive(updates: TrackUpdate[], path: string): Promise<number> {
  const out = createWriteStream(path);
  out.write(TRACKS_CSV_HEADER + '\n');
  for (const u of updates) {
    const m = u.measurement;
    const az = (((Math.atan2(u.x, u.y) * 180) / Math.PI) + 360) % 360;
    const cells = [u.timeS.toFixed(6), u.id, u.x.toFixed(4), u.y.toFixed(4), u.vx.toFixed(4), u.vy.toFixed(4), u.speed.toFixed(4), ((u.headingRad * 180) / Math.PI).toFixed(2),
      u.status, u.quality.toFixed(3), Math.hypot(u.x, u.y).toFixed(4), az.toFixed(3),
      m ? m.x.toFixed(4) : '', m ? m.y.toFixed(4) : '', m ? String(m.rxx) : '', m ? String(m.rxy) : '', m ? String(m.ryy) : '', u.nis !== undefined ? u.nis.toFixed(3) : ''];
    if (!out.write(cells.join(',') + '\n')) await once(out, 'drain');
  }
  out.end();
  await once(out, 'finish');
  return updates.length;
}

/** The floor: the same bytes, formatted beforehand, written in 64 kB pieces. */
async function writeBytes(chunks: Buffer[], rows: number, path: string): Promise<number> {
  const out = createWriteStream(path);
  for (const c of chunks) if (!out.write(c)) await once(out, 'drain');
  out.end();
  await once(out, 'finish');
  return rows;
}

/** `track` in-process through its exported run(), stderr captured (the inference lines). */
async function trackInProcess(input: string, output: string, ...extra: string[]): Promise<{ code: number; err: string }> {
  const write = process.stderr.write;
  let err = '';
  process.stderr.write = ((s: string | Uint8Array) => ((err += String(s)), true)) as typeof process.stderr.write;
  try {
    return { code: await trackCommand(['--in', input, '--out', output, ...NOISE_ARGS, ...extra]), err };
  } finally {
    process.stderr.write = write;
  }
}

const rate = (n: number, ms: number) => (n / ms) * 1000;
const k = (r: number) => `${(r / 1000).toFixed(0)}k`;
/** `412k rows/s (CPU 430k)`: per second of wall time, then per second of CPU time. */
const fig = (m: Timing, unit: string) => `${k(rate(m.count, m.ms))} ${unit}/s (CPU ${k(rate(m.count, m.cpuMs))})`;
/** How many times faster `a` went than `b` on the same work, by wall time then by CPU time. */
const x = (a: Timing, b: Timing) => `×${(b.ms / a.ms).toFixed(2)} (CPU ×${(b.cpuMs / a.cpuMs).toFixed(2)})`;

/**
 * The baseline end to end: the same reader, the `kalman-filter` baseline tracker of
 * kalman-baseline.ts, its updates written as CSV lines in 64 kB pieces. Returns the detections read.
 */
async function baselineEndToEnd(input: string, output: string): Promise<number> {
  const dets: Detection[] = [];
  for await (const b of readDetectionsCsv(input).batches()) for (const d of b) dets.push(d);
  const out = createWriteStream(output);
  let buf = 'time_s,track_id,x_m,y_m,vx_mps,vy_mps\n';
  kalmanBaseline(dets, (t, id, x, y, vx, vy) => {
    buf += `${t.toFixed(4)},${id},${x.toFixed(4)},${y.toFixed(4)},${vx.toFixed(4)},${vy.toFixed(4)}\n`;
    if (buf.length >= 65536) {
      out.write(buf);
      buf = '';
    }
  });
  out.end(buf);
  await once(out, 'finish');
  return dets.length;
}

/** End-to-end figures of one file, for the growth and baseline lines after both sizes. */
interface EndToEnd {
  track: Timing;
  /** `track` and the baseline on the first `prefix` detections of the file. */
  prefix: number;
  trackPrefix: Timing;
  basePrefix: Timing;
}

async function bench(label: string, dets: Detection[], dir: string, prefix: number): Promise<EndToEnd> {
  const input = join(dir, `${label}-detections.csv`);
  const output = join(dir, `${label}-tracks.csv`);
  await writeDetectionsCsv(dets, input);
  const mb = statSync(input).size / 1e6;
  console.log(`\n${label}: ${dets.length} detections, ${mb.toFixed(1)} MB`);

  const rd = await best(3, () => readProject(input));
  const cp = await best(3, () => readCsvParseDefault(input));
  const rl = await best(3, () => readReadlineSplit(input));
  if (rd.count !== dets.length || cp.count !== dets.length || rl.count !== dets.length) throw new Error(`row counts differ: ${rd.count} ${cp.count} ${rl.count} vs ${dets.length}`);
  console.log(`  read   readDetectionsCsv ${fig(rd, 'rows')}, ${((mb / rd.ms) * 1000).toFixed(0)} MB/s`);
  console.log(`         baselines: csv-parse defaults, counting ${fig(cp, 'rows')}: reader ${x(rd, cp)}; readline + split ${fig(rl, 'rows')}: reader ${x(rd, rl)}`);

  // The tracker's output on this file, in memory, feeds the writer figures.
  const read: Detection[] = [];
  for await (const b of readDetectionsCsv(input).batches()) for (const d of b) read.push(d);
  const updates: TrackUpdate[] = [];
  const tr = await best(2, () => {
    const t = trackerFor();
    updates.length = 0;
    for (const d of read) for (const u of t.push(d).updates) updates.push(u);
    for (const u of t.flush().updates) updates.push(u);
    return read.length;
  });
  const chunks: Buffer[] = [];
  const enc = new TracksCsvEncoder(65536);
  enc.header();
  for (const u of updates) {
    enc.add(u);
    if (enc.length >= 65536) chunks.push(enc.take());
  }
  chunks.push(enc.take());
  const wr = await best(3, () => writeProject(updates, output));
  const wn = await best(3, () => writeNaive(updates, output));
  const wb = await best(3, () => writeBytes(chunks, updates.length, output));
  console.log(`  write  tracks CSV writer ${fig(wr, 'rows')}, ${updates.length} rows`);
  console.log(`         baselines: naive toFixed + write per row ${fig(wn, 'rows')}: writer ${x(wr, wn)}; preformatted bytes ${fig(wb, 'rows')}: writer ${x(wr, wb)}`);

  let said = '';
  const e2e = await best(2, async () => {
    const r = await trackInProcess(input, output);
    if (r.code !== 0) throw new Error(`track exited ${r.code}: ${r.err}`);
    said = r.err;
    return dets.length;
  });
  // Same options, same rows out: the two figures time the same tracking work.
  const written = readFileSync(output, 'utf8').split('\n').length - 2;
  if (written !== updates.length) throw new Error(`track wrote ${written} rows, the Tracker alone made ${updates.length}`);
  const threaded = readFileSync(output);
  const oneThread = await best(2, async () => {
    const r = await trackInProcess(input, output, '--io-threads', 'never');
    if (r.code !== 0) throw new Error(`track exited ${r.code}: ${r.err}`);
    return dets.length;
  });
  if (!readFileSync(output).equals(threaded)) throw new Error('track wrote other bytes with --io-threads never');
  console.log(`  track  end to end, in-process run() (reading and writing in worker threads): ${fig(e2e, 'det')}, ${e2e.ms.toFixed(0)} ms, ${said.trim().split('\n').length} stderr lines`);
  console.log(`         baselines: all in one thread (--io-threads never) ${fig(oneThread, 'det')}: track ${x(e2e, oneThread)}; the Tracker alone on the same detections in memory, ${fig(tr, 'det')}: track ${x(e2e, tr)}`);

  const t0 = performance.now();
  const sp = spawnSync(process.execPath, ['--import', 'tsx', join(root, 'bridge/cli/main.ts'), 'track', '--in', input, '--out', output, ...NOISE_ARGS], { cwd: root, encoding: 'utf8' });
  const spawnMs = performance.now() - t0;
  if (sp.status !== 0) throw new Error(`spawned track exited ${sp.status}: ${sp.stderr}`);
  console.log(`  track  end to end, spawned node --import tsx bridge/cli/main.ts track: ${k(rate(dets.length, spawnMs))} det/s, ${spawnMs.toFixed(0)} ms with start-up, one run`);

  // The baseline is quadratic in the track count and slow per update: both run on a prefix.
  const head = join(dir, `${label}-head.csv`);
  await writeDetectionsCsv(dets.slice(0, prefix), head);
  const trackPrefix = await best(2, async () => {
    const r = await trackInProcess(head, output);
    if (r.code !== 0) throw new Error(`track exited ${r.code}: ${r.err}`);
    return prefix;
  });
  const basePrefix = await best(2, () => baselineEndToEnd(head, output));
  console.log(`  track  end to end on the first ${prefix} detections ${fig(trackPrefix, 'det')}; baseline on kalman-filter end to end ${fig(basePrefix, 'det')}: track ${x(trackPrefix, basePrefix)}`);
  return { track: e2e, prefix, trackPrefix, basePrefix };
}

const dir = mkdtempSync(join(tmpdir(), 'echotrail-track-cli-bench-'));
try {
  const small = await bench('100 targets', crowdedLoad(100, 1100, 1), dir, 40000);
  const large = await bench('800 targets', crowdedLoad(800, 140, 2), dir, 20000);
  const perDet = (t: Timing) => t.ms / t.count;
  console.log(`\ntrack end to end: cost per detection, 800 vs 100 targets ×${(perDet(large.track) / perDet(small.track)).toFixed(2)} (goal ≤ 1.5)`);
  console.log(`track end to end vs the kalman-filter baseline end to end, same files: ${x(small.trackPrefix, small.basePrefix)} at 100 targets, ${x(large.trackPrefix, large.basePrefix)} at 800`);
  const goal = rate(small.track.count, small.track.ms) >= 250e3 && rate(large.track.count, large.track.ms) >= 250e3;
  console.log(`goal ≥ 250k det/s end to end: ${goal ? 'met' : 'not met'}`);
} finally {
  rmSync(dir, { recursive: true, force: true });
}
