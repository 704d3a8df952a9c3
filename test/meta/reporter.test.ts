import { describe, expect, it } from 'vitest';
import { SummaryReporter } from '../summary-reporter.ts';

describe('SummaryReporter', () => {
  it('counts passed, failed and skipped tests across modules', () => {
    const fake = (states: string[]) => ({
      children: { allTests: () => states.map((s) => ({ result: () => ({ state: s }) })) },
    });
    let out = '';
    const write = process.stdout.write.bind(process.stdout);
    process.stdout.write = ((chunk: string) => {
      out += chunk;
      return true;
    }) as typeof process.stdout.write;
    try {
      new SummaryReporter().onTestRunEnd([fake(['passed', 'failed']), fake(['passed', 'skipped', 'pending'])] as never);
    } finally {
      process.stdout.write = write;
    }
    expect(out.trim()).toBe('vitest: 2 passed, 1 failed, 2 skipped');
  });
});
