/**
 * Tracking throughput: detections per second through the whole tracker (conversion, gating,
 * assignment, filters, track life, fixed-echo map) on 100 and on 800 simultaneous targets with
 * dense clutter, the growth of the cost per detection between the two, and the same workload
 * through a naive baseline built directly on npm `kalman-filter` (nearest neighbour over every
 * track, the library's generic filter), as a ratio measured in the same run.
 *
 * The load (crowded-load.ts, shared with track-cli) keeps target density the same at both sizes:
 * the growth figure then shows what the spatial index is for — the cost per detection must not
 * depend on how many tracks exist elsewhere. Azimuth noise is 0.1° so that the cross-range error
 * at 20–40 m stays near 5 cm, as on a bench at a few metres with a 1.5° encoder.
 *
 * Run: npm run bench -- track   (about a minute on a 2-core machine)
 */
import { Tracker } from '../bridge/tracking/tracker.ts';
import { crowdedLoad } from './crowded-load.ts';
import { kalmanBaseline } from './kalman-baseline.ts';
import type { Detection } from '../bridge/types.ts';


/** Detections per second of the tracker over `dets` (best of `reps`, after one warm-up pass). */
function measure(dets: Detection[], reps: number, revolutionBatches: boolean): { rate: number; tracks: number; rows: number } {
  let best = Infinity;
  let tracks = 0;
  let rows = 0;
  for (let r = 0; r <= reps; r++) {
    // The load's noise is known, as it would be from a calibrated profile.
    const tr = new Tracker({ revolutionBatches, measurement: { sigmaRangeM: 0.05, sigmaAzimuthRad: (0.1 * Math.PI) / 180 } });
    const t0 = performance.now();
    let n = 0;
    for (const d of dets) n += tr.push(d).updates.length;
    n += tr.flush().updates.length;
    const ms = performance.now() - t0;
    if (r > 0 && ms < best) best = ms;
    tracks = tr.tracks().filter((t) => t.status !== 'tentative').length;
    rows = n;
  }
  return { rate: (dets.length / best) * 1000, tracks, rows };
}

/** The baseline's detections per second over `dets`. */
function baseline(dets: Detection[]): number {
  const t0 = performance.now();
  kalmanBaseline(dets);
  return (dets.length / (performance.now() - t0)) * 1000;
}

const fmt = (r: number) => `${(r / 1000).toFixed(1)}k det/s`;
const small = crowdedLoad(100, 1100, 1);
const large = crowdedLoad(800, 140, 2);
// Two modes of the same tracker: `track` on a file batches half revolutions (the headline
// figure); the live bridge assigns each detection as the beam passes (lower delay, more work).
const a = measure(small, 2, true);
const b = measure(large, 2, true);
const growth = (1 / b.rate) / (1 / a.rate);
console.log(`tracker (files: half-revolution batches), 100 targets: ${small.length} detections, ${fmt(a.rate)} (${(1e9 / a.rate).toFixed(0)} ns/det), ${a.tracks} established tracks at the end, ${a.rows} rows`);
console.log(`tracker (files: half-revolution batches), 800 targets: ${large.length} detections, ${fmt(b.rate)} (${(1e9 / b.rate).toFixed(0)} ns/det), ${b.tracks} established tracks at the end, ${b.rows} rows`);
console.log(`cost per detection, 800 vs 100 targets: ×${growth.toFixed(2)} (goal ≤ 1.5)`);
const la = measure(small, 1, false);
const lb = measure(large, 1, false);
console.log(`tracker (live: per detection), 100 targets: ${fmt(la.rate)}; 800 targets: ${fmt(lb.rate)}; growth ×${(la.rate / lb.rate).toFixed(2)}`);
// The baseline is quadratic in the track count and slow per update: give it a slice of each load.
const baseSmall = baseline(small.slice(0, 40000));
const baseLarge = baseline(large.slice(0, 20000));
console.log(`baseline on kalman-filter, 100 targets: ${fmt(baseSmall)}; 800 targets: ${fmt(baseLarge)}`);
console.log(`tracker / baseline: ×${(a.rate / baseSmall).toFixed(1)} at 100 targets, ×${(b.rate / baseLarge).toFixed(1)} at 800 targets`);
console.log(`goal ≥ 250k det/s: ${a.rate >= 250e3 && b.rate >= 250e3 ? 'met' : 'not met'}`);
