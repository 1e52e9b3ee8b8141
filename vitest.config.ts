import { defineConfig } from "vitest/config";

// One runner for every workspace: `npm test` runs all projects in one process tree and one
// summary. Database-backed projects read PG* variables set by scripts/test.sh.
export default defineConfig({
  test: {
    projects: [
      { test: { name: "signal", root: "./signal", environment: "node", include: ["**/*.test.ts"] } },
      { test: { name: "db", root: "./db", environment: "node", include: ["**/*.test.ts"] } },
      {
        test: {
          name: "ingest-server",
          root: "./ingest-server",
          environment: "node",
          include: ["**/*.test.ts"],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      "./portal/vite.config.ts",
      {
        test: {
          name: "tests",
          root: "./tests",
          environment: "node",
          include: ["**/*.test.ts"],
          exclude: ["e2e/**", "node_modules/**"],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
