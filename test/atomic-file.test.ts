import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
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
