import type { Reporter, TestModule } from 'vitest/node';

/** Ends the run with one plain line, `Tests: N passed, N failed, N skipped`, for CI logs. */
export default class SummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>) {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const mod of testModules) {
      for (const test of mod.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped++;
      }
      // a file that failed to load has no tests but is still a failure
      if (mod.state() === 'failed' && ![...mod.children.allTests()].some((t) => t.result().state === 'failed')) failed++;
    }
    process.stdout.write(`\nTests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}\n`);
  }
}
