import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { run } from '../../bridge/cli/track.ts';
import { simulateRun } from '../../bridge/sim/run.ts';
import { SCENARIOS } from '../../bridge/sim/scenarios.ts';
import { DETECTIONS_CSV_HEADER, detectionCsvLine, readDetectionsCsv } from '../../bridge/ingest/detections-csv.ts';
import { Tracker } from '../../bridge/tracking/tracker.ts';
import { TRACKS_CSV_COLUMNS, TRACKS_CSV_HEADER, trackCsvLine } from '../../bridge/tracking/tracks-csv.ts';

let dir = '';
let good = '';

/** Runs `track` capturing stderr. */
async function track(args: string[]): Promise<{ code: number; err: string }> {
  let err = '';
  const spy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
    err += String(s);
    return true;
  });
  try {
    return { code: await run(args), err };
  } finally {
    spy.mockRestore();
  }
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'echotrail-track-'));
  const sim = simulateRun({ ...SCENARIOS['rail-sweep'], durationS: 40 });
  good = join(dir, 'good.csv');
  writeFileSync(good, [DETECTIONS_CSV_HEADER, ...sim.detections.map(detectionCsvLine)].join('\n') + '\n');
});

afterAll(() => rmSync(dir, { recursive: true, force: true }));

const rows = (path: string) => readFileSync(path, 'utf8').trim().split('\n');

describe('echotrail track', () => {
  it('writes the tracks CSV with the agreed columns, in time order, and says what it inferred', async () => {
    const out = join(dir, 'tracks.csv');
    const r = await track(['--in', good, '--out', out]);
    expect(r.code).toBe(0);
    const lines = rows(out);
    expect(lines[0]).toBe(TRACKS_CSV_COLUMNS.join(','));
    expect(lines[0].startsWith('time_s,track_id,x_m,y_m,vx_mps,vy_mps,speed_mps,heading_deg')).toBe(true);
    expect(lines.length).toBeGreaterThan(20);
    const cells = lines.slice(1).map((l) => l.split(','));
    const t = cells.map((c) => Number(c[0]));
    for (let k = 1; k < t.length; k++) expect(t[k]).toBeGreaterThanOrEqual(t[k - 1]);
    for (const c of cells) {
      expect(c).toHaveLength(TRACKS_CSV_COLUMNS.length);
      expect(['confirmed', 'coasting']).toContain(c[8]);
      // Measurement columns are empty exactly on coasts.
      expect(c[12] === '').toBe(c[8] === 'coasting');
      const heading = Number(c[7]);
      expect(heading).toBeGreaterThanOrEqual(0);
      expect(heading).toBeLessThan(360);
    }
    expect(r.err).toMatch(/antenna: rotating \(inferred/);
    expect(r.err).toMatch(/revolution period: 1\.000 s/);
    expect(r.err).not.toMatch(/skipped/);
  });

  it('writes exactly the rows of the tracker\'s updates on the same detections', async () => {
    const out = join(dir, 'same.csv');
    expect((await track(['--in', good, '--out', out])).code).toBe(0);
    // The options `track` gives the tracker when none are on the command line.
    const tracker = new Tracker({ revolutionBatches: true });
    const expected = [TRACKS_CSV_HEADER];
    for await (const d of readDetectionsCsv(good)) for (const u of tracker.push(d).updates) expected.push(trackCsvLine(u));
    for (const u of tracker.flush().updates) expected.push(trackCsvLine(u));
    expect(expected.length).toBeGreaterThan(20);
    expect(readFileSync(out, 'utf8')).toBe(expected.join('\n') + '\n');
  });

  it('skips bad rows with a line-numbered report and still tracks the good ones', async () => {
    const lines = rows(good);
    lines.splice(200, 0, '12.5,abc,3.0,10'); // line 201: non-numeric azimuth
    lines.splice(300, 0, 'NaN,10,3.0,10');
    lines.splice(400, 0, '1.0,10,3.0,10'); // time going backwards
    lines.splice(500, 0, '30.0,10,99999,10'); // absurd range
    const bad = join(dir, 'bad.csv');
    writeFileSync(bad, lines.join('\n') + '\n');
    const out = join(dir, 'bad-tracks.csv');
    const r = await track(['--in', bad, '--out', out]);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/4 rows skipped: first at line 201: /);
    // The summary line keeps its bound format; the other skipped rows follow, one per line.
    expect(r.err).toContain('echotrail track: 4 rows skipped: first at line 201: azimuth_deg "abc" is not a number\n');
    expect(r.err).toMatch(/echotrail track: {3}line 301: time_s "NaN" is not a number\n/);
    expect(r.err).toMatch(/echotrail track: {3}line 401: time_s 1 is earlier/);
    expect(r.err).toMatch(/echotrail track: {3}line 501: range_m 99999 is outside/);
    expect(rows(out).length).toBeGreaterThan(20);
  });

  it('reads and writes in worker threads with the same output bytes and the same report as in one thread', async () => {
    const lines = rows(good);
    lines.splice(150, 0, '9.5,abc,3.0,10');
    lines.splice(250, 0, '"broken,1,2');
    const bad = join(dir, 'threads-bad.csv');
    writeFileSync(bad, lines.join('\n') + '\n');
    const one = await track(['--in', bad, '--out', join(dir, 'one.csv'), '--io-threads', 'never']);
    const two = await track(['--in', bad, '--out', join(dir, 'two.csv'), '--io-threads', 'always']);
    expect(one.code).toBe(0);
    expect(two.code).toBe(0);
    expect(readFileSync(join(dir, 'two.csv'), 'utf8')).toBe(readFileSync(join(dir, 'one.csv'), 'utf8'));
    expect(two.err).toBe(one.err);
    expect(two.err).toMatch(/2 rows skipped: first at line 151: /);

    // Errors read the same too, and a failed threaded run leaves no file behind.
    const empty = join(dir, 'threads-empty.csv');
    writeFileSync(empty, '');
    const failedOne = await track(['--in', empty, '--out', join(dir, 'never.csv'), '--io-threads', 'never']);
    const failedTwo = await track(['--in', empty, '--out', join(dir, 'never.csv'), '--io-threads', 'always']);
    expect(failedTwo).toEqual(failedOne);
    expect(readdirSync(dir).filter((f) => f.includes('never.csv'))).toEqual([]);
  });

  it('lists at most 20 further skipped rows, then how many more', async () => {
    const lines = rows(good);
    for (let k = 0; k < 30; k++) lines[100 + 5 * k] = 'garbage,1,2,3';
    const bad = join(dir, 'many-bad.csv');
    writeFileSync(bad, lines.join('\n') + '\n');
    const r = await track(['--in', bad, '--out', join(dir, 'many-bad-tracks.csv')]);
    expect(r.code).toBe(0);
    const detail = r.err.split('\n').filter((l) => l.startsWith('echotrail track:   '));
    expect(detail).toHaveLength(21);
    expect(detail[0]).toBe('echotrail track:   line 106: time_s "garbage" is not a number');
    expect(detail[20]).toBe('echotrail track:   … and 9 more');
  });

  it('a failed run leaves the previous output file as it was, and no temporary file behind', async () => {
    const empty = join(dir, 'empty-again.csv');
    writeFileSync(empty, '');
    const keepDir = join(dir, 'keep');
    mkdirSync(keepDir);
    const keep = join(keepDir, 'keep.csv');
    writeFileSync(keep, 'previous result\n');
    const r = await track(['--in', empty, '--out', keep]);
    expect(r.code).toBe(1);
    expect(readFileSync(keep, 'utf8')).toBe('previous result\n');
    expect(readdirSync(keepDir)).toEqual(['keep.csv']);
    // A run that succeeds replaces it.
    expect((await track(['--in', good, '--out', keep])).code).toBe(0);
    expect(rows(keep)[0]).toBe(TRACKS_CSV_COLUMNS.join(','));
    expect(readdirSync(keepDir)).toEqual(['keep.csv']);
  });

  it('refuses unusable input with a one-line reason and a non-zero exit', async () => {
    const empty = join(dir, 'empty.csv');
    writeFileSync(empty, '');
    let r = await track(['--in', empty, '--out', join(dir, 'x.csv')]);
    expect(r.code).not.toBe(0);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/^echotrail track: E_INPUT_EMPTY: .*empty/);

    const cols = join(dir, 'cols.csv');
    writeFileSync(cols, 'time_s,range_m\n0,1\n');
    r = await track(['--in', cols, '--out', join(dir, 'x.csv')]);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(/^echotrail track: E_INPUT_COLUMNS: .*azimuth_deg/);

    const semi = join(dir, 'semi.csv');
    writeFileSync(semi, 'time_s;azimuth_deg;range_m;amplitude\n0;1;2;3\n');
    r = await track(['--in', semi, '--out', join(dir, 'x.csv')]);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/E_INPUT_COLUMNS: .*header lacks .*separated by semicolons/);
    writeFileSync(semi, 'time_s\tazimuth_deg\trange_m\tamplitude\n0\t1\t2\t3\n');
    expect((await track(['--in', semi, '--out', join(dir, 'x.csv')])).err).toMatch(/separated by tabs/);

    r = await track(['--in', join(dir, 'missing.csv'), '--out', join(dir, 'x.csv')]);
    expect(r.code).not.toBe(0);
    expect(r.err).toMatch(/^echotrail track: E_PATH: cannot read .*missing\.csv/);
  });

  it('names a relative input by its full path when it cannot be read', async () => {
    const r = await track(['--in', 'no-such-dir/missing.csv', '--out', join(dir, 'x.csv')]);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`cannot read ${join(process.cwd(), 'no-such-dir/missing.csv')}`);
  });

  it('takes options and a profile; the command line wins over the profile', async () => {
    const profile = join(dir, 'p.json');
    writeFileSync(profile, JSON.stringify({ version: 1, antenna: 'rotating', intervalS: 1, estimateNoise: false, measurement: { sigmaAzimuthDeg: 1.2 }, initiation: { m: 2, n: 3 } }));
    const out = join(dir, 'p.csv');
    const r = await track(['--in', good, '--out', out, '--profile', profile, '--sigma-azimuth', '1.6', '--filter', 'kalman']);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/antenna: rotating \(as given/);
    expect(r.err).toMatch(/σ_azimuth 1\.60° \(as given\)/);
    expect(rows(out).length).toBeGreaterThan(20);

    writeFileSync(profile, JSON.stringify({ version: 1, gate: { probability: 2 } }));
    const bad = await track(['--in', good, '--out', out, '--profile', profile]);
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(/gate\.probability/);
  });

  it('rejects bad option values with exit code 2', async () => {
    for (const args of [['--confirm', '5/3'], ['--gate-probability', '1.5'], ['--filter', 'ekf'], ['--sigma-range', 'x']]) {
      const r = await track(['--in', good, '--out', join(dir, 'y.csv'), ...args]);
      expect(r.code).toBe(2);
    }
  });

  it('documents every option with units and defaults in --help', async () => {
    let out = '';
    const spy = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => {
      out += String(s);
      return true;
    });
    try {
      expect(await run(['--help'])).toBe(0);
    } finally {
      spy.mockRestore();
    }
    for (const opt of ['--in', '--out', '--profile', '--sigma-range', '--sigma-azimuth', '--filter', '--gate-probability', '--confirm', '--no-fixed-echoes', '--interval', '--io-threads']) {
      expect(out).toContain(opt);
    }
    expect(out).toMatch(/\(default: 0\.99\)/);
    expect(out).toMatch(/degrees/);
  });
});
