/**
 * Measurement-noise estimate from the run itself. A stationary reflector (fixed echo, wall, a
 * target parked at its start) returns the same range and azimuth every scan, so the difference
 * between its detections in two consecutive scans is pure noise with standard deviation σ·√2.
 *
 * Only polar bins hit in most scans (persistent, hence stationary) are used, and a detection is
 * paired with the previous scan only where exactly one detection lies within a bin's width, so
 * several reflectors close together (a wall) neither inflate nor shrink the figure. Robust scatter (1.4826·MAD,
 * equal to σ for a Gaussian: common practice) keeps stray clutter pairs from inflating it.
 */
import type { Detection } from '../types.ts';
import { azimuthDiff } from './measurement.ts';

export interface NoiseEstimate {
  sigmaRangeM: number;
  sigmaAzimuthRad: number;
  /** Persistent bins (stationary reflectors, roughly) the estimate is based on. */
  reflectors: number;
  /** Scan-to-scan pairs used. */
  samples: number;
}

const RANGE_BIN = 0.4;
const AZ_BIN = (8 * Math.PI) / 180;
/**
 * Pairing window: ±4·√2 of the typical noise (σ_r 5 cm, σ_az 1.5°) on the scan-to-scan
 * difference; estimates up to about twice those figures stay inside it.
 */
const PAIR_RANGE = 4 * Math.SQRT2 * 0.05;
const PAIR_AZ = (4 * Math.SQRT2 * 1.5 * Math.PI) / 180;

function mad(v: number[]): number {
  const s = v.map(Math.abs).sort((a, b) => a - b);
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : 0.5 * (s[h - 1] + s[h]);
}

function drifts(v: number[]): boolean {
  const mean = v.reduce((a, b) => a + b, 0) / v.length;
  return Math.abs(mean) > 0.5 * 1.4826 * mad(v);
}

/**
 * @param dets detections of the first part of the run, in time order
 * @param sliceS one scan: a revolution (rotating) or a short stretch of a staring run
 */
export function estimateNoise(dets: readonly Detection[], sliceS: number): NoiseEstimate | null {
  if (dets.length < 10 || !(sliceS > 0)) return null;
  const t0 = dets[0].timeS;
  const slices = Math.floor((dets[dets.length - 1].timeS - t0) / sliceS) + 1;
  if (slices < 4) return null;
  const nAz = Math.round((2 * Math.PI) / AZ_BIN);
  // bin → slice → detections
  const bins = new Map<number, Map<number, Detection[]>>();
  const keyOf = (r: number, a: number) => Math.floor(r / RANGE_BIN) * nAz + (Math.floor(a / AZ_BIN) % nAz);
  for (const d of dets) {
    const k = keyOf(d.rangeM, d.azimuthRad);
    const s = Math.floor((d.timeS - t0) / sliceS);
    let b = bins.get(k);
    if (!b) bins.set(k, (b = new Map()));
    const l = b.get(s);
    if (l) l.push(d);
    else b.set(s, [d]);
  }
  const dr: number[] = [];
  const da: number[] = [];
  let reflectors = 0;
  for (const [k, b] of bins) {
    if (b.size < 0.7 * slices) continue;
    const ir = Math.floor(k / nAz);
    const br: number[] = [];
    const ba: number[] = [];
    const ia = k % nAz;
    for (const [s, list] of b) {
      for (const d of list) {
        // The one detection of the previous scan within a bin's width of this one. Where there
        // are several (a wall of reflectors closer than the bins), picking the nearest would cut
        // the tails off the difference distribution and bias σ low, so such pairs are skipped.
        let count = 0;
        let er1 = 0;
        let ea1 = 0;
        for (let i = -1; i <= 1; i++) {
          for (let j = -1; j <= 1; j++) {
            const prev = bins.get((ir + i) * nAz + ((ia + j + nAz) % nAz))?.get(s - 1);
            if (!prev) continue;
            for (const p of prev) {
              const er = d.rangeM - p.rangeM;
              const ea = azimuthDiff(d.azimuthRad, p.azimuthRad);
              if (Math.abs(er) < PAIR_RANGE && Math.abs(ea) < PAIR_AZ) {
                count++;
                er1 = er;
                ea1 = ea;
              }
            }
          }
        }
        if (count === 1) {
          br.push(er1);
          ba.push(ea1);
        }
      }
    }
    // A slowly moving target also fills a bin scan after scan, but its differences share a
    // drift: a bin whose mean difference exceeds half its robust σ is not a stationary one.
    if (br.length < 5 || drifts(br) || drifts(ba)) continue;
    reflectors++;
    dr.push(...br);
    da.push(...ba);
  }
  if (dr.length < 5) return null;
  return { sigmaRangeM: (1.4826 * mad(dr)) / Math.SQRT2, sigmaAzimuthRad: (1.4826 * mad(da)) / Math.SQRT2, reflectors, samples: dr.length };
}
