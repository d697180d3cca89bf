import { writeFileSync } from "node:fs";
import type { Reporter, TestModule } from "vitest/node";

// vitest's own closing lines do not count a file that failed on import or in
// beforeAll as a failure; this does, and hands the counts to run-tests.ts.
export default class SummaryReporter implements Reporter {
  onTestRunEnd(modules: ReadonlyArray<TestModule>, errors: ReadonlyArray<unknown>): void {
    let passed = 0;
    let failed = 0;
    let skipped = 0;
    for (const module of modules) {
      let failedHere = 0;
      for (const test of module.children.allTests()) {
        const state = test.result().state;
        if (state === "passed") passed++;
        else if (state === "failed") failedHere++;
        else skipped++;
      }
      if (failedHere === 0 && module.state() === "failed") failedHere = 1;
      failed += failedHere;
    }
    failed += errors.length;
    const summary = { passed, failed, skipped };
    const file = process.env.RUNWRIGHT_SUMMARY_FILE;
    if (file) writeFileSync(file, JSON.stringify(summary));
    else console.log(`\n${passed} passed, ${failed} failed, ${skipped} skipped`);
  }
}
