/**
 * `npm run bench`: runs every bench/*.bench.ts in turn, each in its own process so that one
 * benchmark's garbage and JIT state do not colour the next. Each prints its own figures and the
 * ratio against a baseline it measures in the same run.
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => f.endsWith('.bench.ts'))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
let failed = 0;
for (const file of files) {
  process.stdout.write(`\n=== ${file} ===\n`);
  const res = spawnSync(process.execPath, ['--import', 'tsx', join(here, file)], { stdio: 'inherit' });
  if (res.status !== 0) failed++;
}
process.exitCode = failed ? 1 : 0;
