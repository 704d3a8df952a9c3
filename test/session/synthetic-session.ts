/**
 * A deterministic synthetic session for tests and the benchmark: a 10 Hz scan with an antenna
 * record, a few detections and the updates of the tracks alive; tracks start every 20 s, live
 * 30–90 s and are deleted (some never are); a fixed-echo map every 60 s; a commanded path at 0.
 * Returns the file and the records as written, in order, for brute-force reference answers.
 */
import { Recorder } from '../../bridge/session/recorder.ts';
import type { StoredRecord } from '../../bridge/session/format.ts';
import type { TrackUpdate } from '../../bridge/types.ts';

export interface SyntheticSession {
  path: string;
  /** Every record written, with the run time the recorder stamped it with. */
  written: { timeS: number; record: StoredRecord }[];
}

/** @param detectionsPerScan mean detections per 0.1 s scan (default 2: 20 detections/s). */
export function writeSyntheticSession(dir: string, durationS: number, name = 'synthetic', detectionsPerScan = 2): SyntheticSession {
  let seed = 987654321;
  const rand = () => ((seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32);
  const rec = new Recorder({ dir, name, startUtc: new Date('2026-12-02T00:00:00Z'), source: { kind: 'simulator', name } });
  if (!rec.open()) throw new Error(rec.status().error ?? 'cannot record');
  const written: SyntheticSession['written'] = [];
  const put = (record: StoredRecord, timeS: number) => {
    rec.record(record, timeS);
    written.push({ timeS, record });
  };
  put({ kind: 'commanded', path: [{ timeS: 0, x: 0, y: 2 }, { timeS: durationS, x: 1, y: 3 }] }, 0);
  const alive = new Map<number, { born: number; dies: number; keep: boolean; hits: number }>();
  let nextId = 1;
  const scans = Math.round(durationS * 10);
  for (let k = 0; k <= scans; k++) {
    const t = k / 10;
    if (k % 200 === 0) alive.set(nextId++, { born: t, dies: t + 30 + 60 * rand(), keep: rand() < 0.2, hits: 0 });
    put({ kind: 'antenna', sample: { timeS: t, azimuthRad: (k * 0.3) % (2 * Math.PI) } }, t);
    const nDet = Math.max(0, Math.round(detectionsPerScan - 1 + rand() * 2));
    for (let i = 0; i < nDet; i++) put({ kind: 'detection', detection: { timeS: t, azimuthRad: rand() * 6.28, rangeM: 1 + rand() * 4, amplitude: 1 + rand() * 100 } }, t);
    for (const [id, tr] of alive) {
      if (t >= tr.dies && !tr.keep) {
        put({ kind: 'deletion', deletion: { timeS: t, id, reason: 'misses' } }, t);
        alive.delete(id);
        continue;
      }
      // Tracks that are never deleted stop being updated once they "die": they stay alive in
      // snapshots with a stale last update, which the reader must keep.
      if (t >= tr.dies) continue;
      tr.hits++;
      const a = (t - tr.born) * 0.1 + id;
      const update: TrackUpdate = {
        timeS: t, id, status: tr.hits > 3 ? 'confirmed' : 'tentative', x: Math.sin(a) * 2, y: 2 + Math.cos(a), vx: 0.2, vy: -0.1,
        speed: Math.hypot(0.2, 0.1), headingRad: 2, pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.8, moving: true, hits: tr.hits, misses: 0,
      };
      put({ kind: 'track', update }, t);
    }
    if (k % 600 === 300) put({ kind: 'fixed-echoes', echoes: [{ x: 1, y: 1, rangeM: Math.SQRT2, azimuthRad: Math.PI / 4, seen: k, amplitude: 50 }] }, t);
  }
  rec.closeSync();
  return { path: rec.status().path!, written };
}
