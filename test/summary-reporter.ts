/**
 * Prints one plain closing line, `vitest: N passed, N failed, N skipped`, after the default
 * reporter's output, so that CI logs end with a count any tool can read. A test file that could
 * not run at all (a syntax error, a failing import) and an error outside any test are counted
 * too: the line must never say "0 failed" for a red run.
 */
import type { Reporter, SerializedError, TestModule } from 'vitest/node';

export class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>, unhandledErrors: ReadonlyArray<SerializedError> = []): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    let brokenFiles = 0;
    for (const mod of testModules) {
      // Errors of the file itself (collection, import, syntax), not of its tests.
      if (mod.errors().length > 0) brokenFiles++;
      for (const test of mod.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
    }
    const extra = [brokenFiles ? `${brokenFiles} file(s) failed to run` : '', unhandledErrors.length ? `${unhandledErrors.length} unhandled error(s)` : ''].filter(Boolean);
    process.stdout.write(`\nvitest: ${passed} passed, ${failed} failed, ${skipped} skipped${extra.length ? ', ' + extra.join(', ') : ''}\n`);
  }
}
