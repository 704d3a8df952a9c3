// Tests bridge/cli/simulate.ts (kept beside the simulator's tests).
import { mkdtemp, readFile, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { describe, expect, it, vi } from 'vitest';
import { run } from '../../bridge/cli/simulate.ts';
import { readDetectionsCsv } from '../../bridge/ingest/detections-csv.ts';

/** Runs the command with stdout and stderr captured; returns the exit code and both texts. */
async function captured(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const outSpy = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => {
    out += String(s);
    return true;
  });
  const errSpy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
    err += String(s);
    return true;
  });
  try {
    return { code: await run(argv), out, err };
  } finally {
    outSpy.mockRestore();
    errSpy.mockRestore();
  }
}

describe('echotrail simulate', () => {
  it('writes detections the reader accepts, plus truth and commanded files', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    const out = join(dir, 'd.csv');
    const code = await run(['--scenario', 'crossing-pair', '--seed', '4', '--duration', '12', '--out', out, '--truth', join(dir, 't.csv'), '--commanded', join(dir, 'c.csv')]);
    expect(code).toBe(0);
    const reader = readDetectionsCsv(Readable.from([await readFile(out, 'utf8')]));
    let n = 0;
    for await (const d of reader) if (d.timeS <= 12) n++;
    expect(n).toBeGreaterThan(100);
    expect(reader.report.skipped).toBe(0);
    const truth = (await readFile(join(dir, 't.csv'), 'utf8')).trim().split('\n');
    expect(truth).toHaveLength(1 + 2 * 121); // two targets at 10 Hz over 0…12 s
    expect((await readFile(join(dir, 'c.csv'), 'utf8')).split('\n')[0]).toBe('time_s,target_id,x_m,y_m');
  });

  it('writes one commanded file per target when the path holds {id}', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    expect(await run(['--scenario', 'crossing-pair', '--duration', '5', '--out', join(dir, 'd.csv'), '--commanded', join(dir, 'cmd-{id}.csv')])).toBe(0);
    for (const id of [1, 2]) {
      const lines = (await readFile(join(dir, `cmd-${id}.csv`), 'utf8')).trim().split('\n');
      expect(lines).toHaveLength(1 + 51);
      expect(lines.slice(1).every((l) => l.split(',')[1] === String(id))).toBe(true);
    }
  });

  it('takes a scenario file and overrides, and fails cleanly on a bad one', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    const scn = join(dir, 's.json');
    await writeFile(scn, JSON.stringify({ durationS: 3, falseAlarmRateHz: 0, pd: 1, targets: [{ trajectory: { kind: 'static', at: { x: 0, y: 2 } } }] }));
    const out = join(dir, 'd.csv');
    expect(await run(['--scenario', scn, '--out', out, '--period', '0.5'])).toBe(0);
    expect((await readFile(out, 'utf8')).trim().split('\n')).toHaveLength(1 + 6);
    await writeFile(scn, JSON.stringify({ durationS: -3 }));
    expect(await run(['--scenario', scn, '--out', out])).toBe(1);
    expect(await run(['--no-such-option'])).toBe(2);
  });

  it('refuses negative noise σ, rates and lags as usage errors (exit 2), and takes σ = 0', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'echotrail-simcli-'));
    const out = join(dir, 'd.csv');
    for (const [opt, v] of [['--sigma-range', '-1'], ['--sigma-azimuth', '-0.5'], ['--false-alarm-rate', '-2'], ['--lag', '-0.1'], ['--pd', '1.5']]) {
      const r = await captured(['--duration', '2', '--out', out, opt, v]);
      expect(r.code, `${opt} ${v}`).toBe(2);
      expect(r.err).toContain(opt);
    }
    await expect(readFile(out, 'utf8')).rejects.toThrow(); // refused before anything was written
    const zero = await captured(['--duration', '2', '--out', out, '--sigma-range', '0', '--sigma-azimuth', '0', '--print-scenario']);
    expect(zero.code).toBe(0);
    expect(JSON.parse(zero.out)).toMatchObject({ sigmaRangeM: 0, sigmaAzimuthDeg: 0 });
  });

  it('refuses a seed that is not an integer (exit 2) rather than cutting it', async () => {
    for (const seed of ['1.5', '-0.25', '1e300']) {
      const r = await captured(['--seed', seed, '--print-scenario']);
      expect(r.code, `--seed ${seed}`).toBe(2);
      expect(r.err).toMatch(/--seed.*integer/);
    }
    const ok = await captured(['--seed', '-7', '--print-scenario']);
    expect(ok.code).toBe(0);
    expect(JSON.parse(ok.out).seed).toBe(-7);
  });

  it("keeps the scenario's antenna period unless --period is given, and says so in --help", async () => {
    const period = async (argv: string[]) => JSON.parse((await captured(['--scenario', 'turntable', '--print-scenario', ...argv])).out).antenna;
    expect(await period([])).toEqual({ mode: 'rotating', periodS: 0.5 });
    expect(await period(['--period', '2'])).toEqual({ mode: 'rotating', periodS: 2 });
    expect(await period(['--antenna', 'rotating'])).toEqual({ mode: 'rotating', periodS: 0.5 });
    expect(await period(['--antenna', 'staring'])).toEqual({ mode: 'staring' });
    const help = (await captured(['--help'])).out.replace(/\s+/g, ' ');
    expect(help).toMatch(/--period <s> +revolution period of a rotating antenna, seconds \(default: the scenario's, else 1\)/);
  });
});
