// Every subcommand's --help reads alike: wrapped to the terminal (80 columns when not a terminal,
// as in this test) and defaults written one way, "(default: …)", as commander writes its own.
import { describe, expect, it, vi } from 'vitest';

const COMMANDS: [string, () => Promise<{ run(argv: string[]): Promise<number> }>, string[]][] = [
  ['track', () => import('../../bridge/cli/track.ts'), []],
  ['compare', () => import('../../bridge/cli/compare.ts'), []],
  ['simulate', () => import('../../bridge/cli/simulate.ts'), []],
  ['calibrate offsets', () => import('../../bridge/cli/calibrate.ts'), ['offsets']],
  ['calibrate frame', () => import('../../bridge/cli/calibrate.ts'), ['frame']],
  ['tune', () => import('../../bridge/cli/tune.ts'), []],
  ['sessions', () => import('../../bridge/cli/sessions.ts'), []],
  ['feed', () => import('../../bridge/cli/feed.ts'), []],
  ['demo', () => import('../../bridge/cli/demo.ts'), []],
  ['start', () => import('../../bridge/cli/start.ts'), []],
];

async function help(load: () => Promise<{ run(argv: string[]): Promise<number> }>, pre: string[]): Promise<string> {
  let out = '';
  const spy = vi.spyOn(process.stdout, 'write').mockImplementation((s: string | Uint8Array) => {
    out += String(s);
    return true;
  });
  try {
    expect(await (await load()).run([...pre, '--help'])).toBe(0);
  } finally {
    spy.mockRestore();
  }
  return out;
}

describe('--help of every subcommand', () => {
  for (const [name, load, pre] of COMMANDS) {
    it(`${name}: wrapped to 80 columns, defaults as "(default: …)"`, async () => {
      const text = await help(load, pre);
      expect(text).toMatch(/^Usage: echotrail /);
      const long = text.split('\n').filter((l) => [...l].length > 80);
      expect(long).toEqual([]);
      expect(text).not.toMatch(/\(default [^:]/);
    });
  }
});
