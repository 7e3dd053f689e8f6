import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    exclude: ["dist/**", "node_modules/**"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    // Two cores on CI: more forks only fight over them.
    maxWorkers: 2,
  },
});
