/**
 * For test/atomic-file.test.ts: starts writing `argv[2]` atomically, says "writing" on stdout once
 * the temporary file holds something, then waits to be interrupted.
 */
import { writeFileSync } from 'node:fs';
import { writeAtomically } from '../../bridge/atomic-file.ts';

await writeAtomically([process.argv[2]], async ([tmp]) => {
  writeFileSync(tmp, 'half a result\n');
  process.stdout.write('writing\n');
  // A timer keeps the process alive (a bare pending promise would let it exit).
  await new Promise(() => setInterval(() => undefined, 1000));
});
