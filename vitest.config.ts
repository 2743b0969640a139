import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // Process-level tests spawn the built CLI; keep parallel files modest on a 2-core machine.
    maxWorkers: 2,
    reporters: ['default', './test/summary-reporter.ts'],
  },
});
