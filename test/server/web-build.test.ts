import { describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { newestMtime, webBuildIsStale } from '../../bridge/server/web-build.ts';

function tree(): string {
  const root = mkdtempSync(join(tmpdir(), 'et-web-'));
  mkdirSync(join(root, 'web', 'src', 'panels'), { recursive: true });
  writeFileSync(join(root, 'web', 'index.html'), '<!doctype html>');
  writeFileSync(join(root, 'web', 'src', 'panels', 'a.svelte'), '<p>a</p>');
  writeFileSync(join(root, 'vite.config.ts'), 'export default {}');
  return root;
}
const at = (path: string, s: number): void => utimesSync(path, s, s);

describe('web build staleness', () => {
  it('is stale without a build, fresh after one, stale again when a source file changes', async () => {
    const root = tree();
    for (const f of ['web/index.html', 'web/src/panels/a.svelte', 'vite.config.ts', 'web/src/panels', 'web/src']) at(join(root, f), 1000);
    expect(await webBuildIsStale(root)).toBe(true);
    mkdirSync(join(root, 'web', 'dist'));
    writeFileSync(join(root, 'web', 'dist', 'index.html'), 'built');
    at(join(root, 'web', 'dist', 'index.html'), 2000);
    expect(await webBuildIsStale(root)).toBe(false);
    at(join(root, 'web', 'src', 'panels', 'a.svelte'), 3000);
    expect(await webBuildIsStale(root)).toBe(true);
    expect(await newestMtime(join(root, 'web', 'src'))).toBe(3_000_000);
    expect(await newestMtime(join(root, 'missing'))).toBe(0);
  });
});
