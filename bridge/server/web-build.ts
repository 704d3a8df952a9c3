/**
 * Builds the dashboard (web/ → web/dist) with the project's own Vite when the build is missing
 * or older than its sources, so `npm start` on a fresh checkout or after a pull shows the current
 * dashboard without a separate step.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { readdir, stat } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { EchotrailError } from '../errors.ts';

export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Newest modification time under `path` (a file or a folder, recursively), ms; 0 when absent. */
export async function newestMtime(path: string): Promise<number> {
  const info = await stat(path).catch(() => null);
  if (!info) return 0;
  if (!info.isDirectory()) return info.mtimeMs;
  let newest = info.mtimeMs;
  for (const entry of await readdir(path)) newest = Math.max(newest, await newestMtime(join(path, entry)));
  return newest;
}

/** True when web/dist/index.html is missing or older than anything the build reads. */
export async function webBuildIsStale(root = REPO_ROOT): Promise<boolean> {
  const built = await stat(join(root, 'web', 'dist', 'index.html')).catch(() => null);
  if (!built) return true;
  const sources = Math.max(
    await newestMtime(join(root, 'web', 'src')),
    await newestMtime(join(root, 'web', 'index.html')),
    await newestMtime(join(root, 'vite.config.ts')),
  );
  return sources > built.mtimeMs;
}

/** Runs `vite build` from the local node_modules when the build is stale; the output goes to `log`. */
export async function ensureWebBuild(log: (line: string) => void, root = REPO_ROOT): Promise<boolean> {
  if (!(await webBuildIsStale(root))) return false;
  if (!existsSync(join(root, 'web', 'index.html'))) {
    log('echotrail: no web/index.html; serving without a dashboard page');
    return false;
  }
  const vite = join(root, 'node_modules', '.bin', 'vite');
  if (!existsSync(vite)) throw new EchotrailError('E_PATH', `cannot build the dashboard: ${vite} is missing; run npm ci`);
  log('echotrail: building the dashboard (vite build)…');
  const code = await new Promise<number>((res) => {
    const child = spawn(vite, ['build', '--logLevel', 'warn'], { cwd: root, stdio: ['ignore', 'inherit', 'inherit'] });
    child.on('error', () => res(-1));
    child.on('exit', (c) => res(c ?? -1));
  });
  if (code !== 0) throw new EchotrailError('E_OPTION', `the dashboard build failed (vite exit ${code}); fix the error above or start with --no-build`);
  return true;
}
