import { defineConfig } from "vitest/config";

// Browser tests run on their own (`npx vitest run -c tests/e2e/vitest.e2e.config.ts`) against a
// running product whose URL is in PENDULA_E2E_URL. One fork, one file at a time: every file drives
// the same seeded database, and a second Chromium on a 2-core machine only makes both slower.
export default defineConfig({
  test: {
    name: "e2e",
    root: import.meta.dirname,
    environment: "node",
    include: ["**/*.e2e.test.ts"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: "forks",
    maxWorkers: 1,
    fileParallelism: false,
    sequence: { concurrent: false },
  },
});
