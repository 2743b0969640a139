import type { Reporter, TestModule } from 'vitest/node';

/**
 * Prints one plain closing line, "vitest: N passed, N failed, N skipped", after vitest's own
 * summary, so that any log reader can count the tests without parsing colours; skipped tests are
 * listed by name before it.
 */
export default class PlainSummaryReporter implements Reporter {
  onTestRunEnd(testModules: ReadonlyArray<TestModule>): void {
    let passed = 0;
    let failed = 0;
    const skipped: string[] = [];
    for (const mod of testModules) {
      for (const test of mod.children.allTests()) {
        const state = test.result().state;
        if (state === 'passed') passed++;
        else if (state === 'failed') failed++;
        else skipped.push(`${mod.moduleId.split('/test/').pop() ?? mod.moduleId} > ${test.name}`);
      }
    }
    // a skipped test is named (with its reason, when its name carries one): never a silent pass
    for (const name of skipped) process.stdout.write(`\nskipped: ${name}`);
    process.stdout.write(`\nvitest: ${passed} passed, ${failed} failed, ${skipped.length} skipped\n`);
  }
}
