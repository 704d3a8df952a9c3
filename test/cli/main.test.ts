import { describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const main = fileURLToPath(new URL('../../bridge/cli/main.ts', import.meta.url));

describe('echotrail entry (bridge/cli/main.ts)', () => {
  it('stops quietly when its output pipe closes early (`… | head`), with no EPIPE trace', async () => {
    // simulate writes a long CSV to stdout; the reader takes one chunk and closes its end.
    const child = spawn(process.execPath, ['--import', 'tsx', main, 'simulate', '--scenario', 'turntable', '--duration', '3000'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (b: Buffer) => (stderr += b.toString()));
    child.stdout.once('data', () => child.stdout.destroy());
    const code = await new Promise<number | null>((res) => child.on('close', (c) => res(c)));
    expect(stderr).not.toContain('EPIPE');
    expect(stderr).not.toContain('Unhandled');
    expect(code).toBe(0);
  }, 30_000);
});
