import { describe, expect, it } from 'vitest';
import { ImmCv2 } from '../../bridge/tracking/imm.ts';
import { KalmanCv } from '../../bridge/tracking/kalman-cv.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import type { Measurement } from '../../bridge/types.ts';

const R = 0.05 ** 2;
const opts = { model: 'dwna' as const, sigmaLow: 0.05, sigmaHigh: 1, sojournLowS: 10, sojournHighS: 2, sigmaVel0: 0.75 };

/** 1 s scans; the target glides at +0.5 m/s along x, reverses abruptly at t = 20 s. */
function path(t: number): number {
  return t <= 20 ? 0.5 * t : 10 - 0.5 * (t - 20);
}

function run(rngSeed: number) {
  const rng = createRng(rngSeed);
  const z = (t: number): Measurement => ({ timeS: t, x: path(t) + rng.normal() * 0.05, y: 3 + rng.normal() * 0.05, rxx: R, rxy: 0, ryy: R });
  const m0 = z(0);
  return { imm: new ImmCv2(m0, opts), quiet: new KalmanCv(m0, { model: 'dwna', sigmaAccel: 0.05, sigmaVel0: 0.75 }), z };
}

describe('IMM of CV at two noise levels (Blom & Bar-Shalom 1988; Bar-Shalom et al. 2001, §11.6)', () => {
  it('settles in the quiet model on a glide and switches to the manoeuvre model at a reversal', () => {
    const { imm, z } = run(1);
    let muBefore = 0;
    let muAfter = 0;
    for (let t = 1; t <= 24; t++) {
      const m = z(t);
      imm.predict(t);
      imm.update(m);
      if (t === 19) muBefore = imm.mu[1];
      if (t === 22) muAfter = imm.mu[1];
    }
    // Chosen tolerances, not published figures: the quiet model must dominate a steady glide and
    // the manoeuvre model take over within three updates of the reversal.
    expect(muBefore).toBeLessThan(0.2);
    expect(muAfter).toBeGreaterThan(0.5);
    expect(imm.mu[0] + imm.mu[1]).toBeCloseTo(1, 12);
  });

  it('recovers from the reversal faster than the quiet CV model alone, and gates where it would not', () => {
    let immErr = 0;
    let quietErr = 0;
    let immGated = 0;
    let quietGated = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const { imm, quiet, z } = run(seed);
      for (let t = 1; t <= 26; t++) {
        const m = z(t);
        // 99 % gate, 2 dof: 9.2103 (NIST/SEMATECH χ² table).
        if (t === 21) {
          if (imm.gate(m).d2 < 9.2103) immGated++;
          if (quiet.gate(m).d2 < 9.2103) quietGated++;
        }
        imm.predict(t);
        imm.update(m);
        quiet.predict(t);
        quiet.update(m);
        if (t >= 21) {
          immErr += Math.abs(imm.estimate().x - path(t));
          quietErr += Math.abs(quiet.estimate().x - path(t));
        }
      }
    }
    // Chosen tolerances: at least half the error of the quiet model alone, and most of the 20
    // post-reversal detections inside the gate.
    expect(immErr).toBeLessThan(0.5 * quietErr);
    expect(immGated).toBeGreaterThanOrEqual(quietGated);
    expect(immGated).toBeGreaterThan(15);
  });

  it('keeps a symmetric positive-definite covariance through mixing', () => {
    const { imm, z } = run(3);
    for (let t = 0.5; t <= 30; t += 0.5) {
      imm.predict(t);
      imm.update(z(t));
      const e = imm.estimate();
      expect(e.pxx).toBeGreaterThan(0);
      expect(e.pxx * e.pyy - e.pxy * e.pxy).toBeGreaterThan(0);
      for (const f of imm.models) for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) expect(f.P[i * 4 + j]).toBeCloseTo(f.P[j * 4 + i], 12);
    }
  });
});
