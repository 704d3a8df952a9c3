import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { once } from 'node:events';
import { atomicFile, writeAtomically } from '../bridge/atomic-file.ts';
import { EchotrailError } from '../bridge/errors.ts';

const dir = () => mkdtempSync(join(tmpdir(), 'echotrail-atomic-'));

describe('atomic result files', () => {
  it('replaces the file only when the body succeeds, and leaves no temporary file either way', async () => {
    const d = dir();
    const out = join(d, 'tracks.csv');
    writeFileSync(out, 'old\n');
    await expect(
      writeAtomically([out], async ([tmp]) => {
        writeFileSync(tmp, 'half written');
        throw new EchotrailError('E_INPUT_ROW', 'bad input');
      }),
    ).rejects.toThrow('bad input');
    expect(readFileSync(out, 'utf8')).toBe('old\n');
    await writeAtomically([out], async ([tmp]) => writeFileSync(tmp, 'new\n'));
    expect(readFileSync(out, 'utf8')).toBe('new\n');
    expect(readdirSync(d)).toEqual(['tracks.csv']);
  });

  for (const [signal, code] of [['SIGINT', 130], ['SIGTERM', 143]] as const) {
    it(`an interrupted run (${signal}) removes its temporary file, keeps the old result and exits ${code}`, async () => {
      const d = dir();
      const out = join(d, 'tracks.csv');
      writeFileSync(out, 'old\n');
      const child = spawn(process.execPath, ['--import', 'tsx', join(import.meta.dirname, 'helpers', 'atomic-hang.ts'), out], { stdio: ['ignore', 'pipe', 'inherit'] });
      let said = '';
      child.stdout!.on('data', (b: Buffer) => (said += b.toString()));
      while (!said.includes('writing')) await once(child.stdout!, 'data');
      expect(readdirSync(d).length).toBe(2);
      child.kill(signal);
      const [exitCode] = await once(child, 'exit');
      expect(exitCode).toBe(code);
      expect(readdirSync(d)).toEqual(['tracks.csv']);
      expect(readFileSync(out, 'utf8')).toBe('old\n');
    });
  }

  it('passes "-" (stdout) through untouched', async () => {
    const seen = await writeAtomically(['-'], async (paths) => paths);
    expect(seen).toEqual(['-']);
  });

  it('says which folder is missing, with code E_PATH, without naming the temporary file', () => {
    const out = join(dir(), 'no', 'such', 'folder', 'd.csv');
    let err: unknown;
    try {
      atomicFile(out);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(EchotrailError);
    expect((err as EchotrailError).code).toBe('E_PATH');
    expect((err as Error).message).toContain('folder');
    expect((err as Error).message).toContain(out);
    expect((err as Error).message).not.toContain('.tmp');
  });
});
