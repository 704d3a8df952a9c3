/**
 * The crowded rotating-antenna load shared by the tracking benchmarks (track, track-cli): generated
 * here, with a seed, so that both measure the same detections.
 */
import { createRng } from '../bridge/sim/prng.ts';
import type { Detection } from '../bridge/types.ts';

const TWO_PI = 2 * Math.PI;

/**
 * Rotating antenna (1 s). Targets on 0.5 m circles, placed uniformly over the annulus 20–40 m,
 * in a sector whose width grows with n (45° for 100 targets, 360° for 800): the same density and
 * the same spread of ranges — hence of gate sizes — at both sizes. Clutter uniform over the same
 * sector, one per 10 m² per scan; a fixed echo per 20 targets.
 */
export function crowdedLoad(n: number, scans: number, seed: number): Detection[] {
  const rng = createRng(seed);
  const R1 = 20;
  const R2 = 40;
  const sector = (TWO_PI * n) / 800;
  const place = () => {
    const r = Math.sqrt(rng.uniform() * (R2 * R2 - R1 * R1) + R1 * R1);
    const a = rng.uniform() * sector;
    return { x: r * Math.sin(a), y: r * Math.cos(a) };
  };
  const targets = Array.from({ length: n }, (_, i) => ({ c: place(), ph: rng.between(0, TWO_PI), w: (TWO_PI / rng.between(15, 40)) * (i % 2 ? 1 : -1) }));
  const echoes = Array.from({ length: Math.ceil(n / 20) }, place);
  const area = (sector / 2) * (R2 * R2 - R1 * R1);
  const out: Detection[] = [];
  const sr = 0.05;
  const sa = (0.1 * Math.PI) / 180;
  for (let k = 0; k < scans; k++) {
    const scan: Detection[] = [];
    const emit = (x: number, y: number, amp: number) => {
      let az = Math.atan2(x, y);
      if (az < 0) az += TWO_PI;
      const azm = (((az + rng.normal() * sa) % TWO_PI) + TWO_PI) % TWO_PI;
      scan.push({ timeS: k + az / TWO_PI, azimuthRad: azm, rangeM: Math.hypot(x, y) + rng.normal() * sr, amplitude: amp });
    };
    for (const t of targets) {
      if (rng.uniform() > 0.9) continue;
      const a = t.ph + t.w * k;
      emit(t.c.x + 0.5 * Math.cos(a), t.c.y + 0.5 * Math.sin(a), 20);
    }
    for (const e of echoes) if (rng.uniform() < 0.95) emit(e.x, e.y, 30);
    const nc = rng.poisson(area / 10);
    for (let c = 0; c < nc; c++) {
      const p = place();
      emit(p.x, p.y, 3);
    }
    scan.sort((a, b) => a.timeS - b.timeS);
    for (const d of scan) out.push(d);
  }
  return out;
}
