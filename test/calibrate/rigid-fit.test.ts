import { describe, expect, it } from 'vitest';
import { frameWarnings } from '../../bridge/calibrate/frame-align.ts';
import { applyRigid, fitRigid2D, type XY } from '../../bridge/calibrate/rigid-fit.ts';
import { createRng } from '../../bridge/sim/prng.ts';
import { hasCode } from '../../bridge/errors.ts';

describe('fitRigid2D', () => {
  it("reproduces the rotation of Umeyama's worked example", () => {
    // Umeyama 1991 (IEEE PAMI 13(4):376–380), numerical example: x = {(0,0),(1,0),(0,2)},
    // y = {(0,0),(−1,0),(0,2)} gives R = [[0.832, 0.555], [−0.555, 0.832]], c = 0.721,
    // t = (−0.800, 0.400) (values recalled from the paper). Our fit has c = 1: R is the same,
    // and the rigid translation is ȳ − R·x̄.
    const p = [{ x: 0, y: 0 }, { x: 1, y: 0 }, { x: 0, y: 2 }];
    const q = [{ x: 0, y: 0 }, { x: -1, y: 0 }, { x: 0, y: 2 }];
    const f = fitRigid2D(p, q);
    expect(Math.cos(f.rotationRad)).toBeCloseTo(0.832, 3);
    expect(Math.sin(f.rotationRad)).toBeCloseTo(-0.555, 3);
    const rpx = Math.cos(f.rotationRad) / 3 - Math.sin(f.rotationRad) * (2 / 3);
    const rpy = Math.sin(f.rotationRad) / 3 + Math.cos(f.rotationRad) * (2 / 3);
    expect(f.translation.x).toBeCloseTo(-1 / 3 - rpx, 12);
    expect(f.translation.y).toBeCloseTo(2 / 3 - rpy, 12);
    // Umeyama's scale c = Σ singular values / σx², here √((4/3)² + 2²)/(30/9): recovers 0.721,
    // and his t = ȳ − c·R·x̄ = (−0.800, 0.400).
    const c = Math.sqrt((4 / 3) ** 2 + 4) / (30 / 9);
    expect(c).toBeCloseTo(0.721, 3);
    expect(-1 / 3 - c * rpx).toBeCloseTo(-0.8, 3);
    expect(2 / 3 - c * rpy).toBeCloseTo(0.4, 3);
  });

  it('recovers an exact rotation and translation', () => {
    const p = [{ x: 0, y: 0 }, { x: 1, y: 0 }, { x: 1, y: 1 }, { x: 0, y: 1 }];
    const rot = (30 * Math.PI) / 180;
    const q = p.map((v) => applyRigid(v, rot, { x: 2, y: -1 }));
    const f = fitRigid2D(p, q);
    expect(f.rotationRad).toBeCloseTo(rot, 12);
    expect(f.translation.x).toBeCloseTo(2, 12);
    expect(f.translation.y).toBeCloseTo(-1, 12);
    expect(f.rmsM).toBeLessThan(1e-12);
  });

  it('with noise, the closed form is the minimum of a brute-force search over φ', () => {
    const rng = createRng(4);
    const p: XY[] = Array.from({ length: 60 }, (_, i) => ({ x: Math.cos(i / 5) * 1.2, y: 3 + Math.sin(i / 2.5) * 0.6 }));
    const q = p.map((v) => {
      const m = applyRigid(v, 0.05, { x: 0.1, y: -0.2 });
      return { x: m.x + rng.normal(0, 0.03), y: m.y + rng.normal(0, 0.03) };
    });
    const f = fitRigid2D(p, q);
    const rss = (phi: number) => {
      // For a fixed φ the best t is q̄ − R·p̄ (common practice: LS intercept).
      const mp = p.reduce((a, v) => ({ x: a.x + v.x / p.length, y: a.y + v.y / p.length }), { x: 0, y: 0 });
      const mq = q.reduce((a, v) => ({ x: a.x + v.x / q.length, y: a.y + v.y / q.length }), { x: 0, y: 0 });
      const rp = applyRigid(mp, phi, { x: 0, y: 0 });
      const t = { x: mq.x - rp.x, y: mq.y - rp.y };
      return p.reduce((a, v, i) => {
        const m = applyRigid(v, phi, t);
        return a + (q[i].x - m.x) ** 2 + (q[i].y - m.y) ** 2;
      }, 0);
    };
    let best = 0;
    for (let phi = -0.2; phi <= 0.2; phi += 1e-5) if (rss(phi) < rss(best)) best = phi;
    expect(Math.abs(f.rotationRad - best)).toBeLessThan(2e-5);
    expect(Math.abs(f.rotationRad - 0.05)).toBeLessThan(3 * f.rotationSeRad);
    expect(f.sigmaM).toBeGreaterThan(0.02);
    expect(f.sigmaM).toBeLessThan(0.04);
  });

  it('refuses degenerate point sets with E_CALIBRATION', () => {
    const line = Array.from({ length: 10 }, (_, i) => ({ x: i * 0.2, y: 2 }));
    const moved = line.map((v) => applyRigid(v, 0.1, { x: 0, y: 0 }));
    const fail = (f: () => unknown) => {
      try {
        f();
      } catch (e) {
        return e;
      }
      return null;
    };
    const e1 = fail(() => fitRigid2D(line, moved));
    expect(hasCode(e1, 'E_CALIBRATION')).toBe(true);
    expect((e1 as Error).message).toMatch(/straight line/);
    const allowed = fitRigid2D(line, moved, { allowCollinear: true });
    expect(allowed.rotationRad).toBeCloseTo(0.1, 10);
    // Accepted, but said: the shift along the line holds any lag (frameWarnings, shown to the user).
    expect(allowed.collinear).toBe(true);
    expect(frameWarnings(allowed)).toEqual([expect.stringMatching(/^the path is a straight line: any tracking lag along it went into the shift/)]);
    expect(frameWarnings({ collinear: false })).toEqual([]);
    const still = Array.from({ length: 10 }, () => ({ x: 1, y: 2 }));
    expect((fail(() => fitRigid2D(still, still)) as Error).message).toMatch(/spread/);
    expect(hasCode(fail(() => fitRigid2D(line.slice(0, 2), moved.slice(0, 2))), 'E_CALIBRATION')).toBe(true);
  });
});
