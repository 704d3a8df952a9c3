import { describe, expect, it } from 'vitest';
import { SummaryReporter } from '../summary-reporter.ts';

/** A stand-in for vitest's TestModule: tests in the given states, and errors of the file itself. */
const fake = (states: string[], fileErrors: unknown[] = []) => ({
  errors: () => fileErrors,
  children: { allTests: () => states.map((s) => ({ result: () => ({ state: s }) })) },
});

function captured(run: () => void): string {
  let out = '';
  const write = process.stdout.write.bind(process.stdout);
  process.stdout.write = ((chunk: string) => {
    out += chunk;
    return true;
  }) as typeof process.stdout.write;
  try {
    run();
  } finally {
    process.stdout.write = write;
  }
  return out.trim();
}

describe('SummaryReporter', () => {
  it('counts passed, failed and skipped tests across modules', () => {
    const out = captured(() => new SummaryReporter().onTestRunEnd([fake(['passed', 'failed']), fake(['passed', 'skipped', 'pending'])] as never));
    expect(out).toBe('vitest: 2 passed, 1 failed, 2 skipped');
  });

  it('never reads "0 failed" alone when a file could not run or an error escaped the tests', () => {
    // A file with a syntax error has no tests and one error of its own.
    const out = captured(() => new SummaryReporter().onTestRunEnd([fake(['passed']), fake([], [{ message: 'Transform failed' }])] as never, [{ message: 'boom' }] as never));
    expect(out).toBe('vitest: 1 passed, 0 failed, 0 skipped, 1 file(s) failed to run, 1 unhandled error(s)');
  });
});
