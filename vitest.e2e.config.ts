import { defineConfig } from "vitest/config";

// Browser journeys: playwright-core driving Debian's chromium against the built app.
export default defineConfig({
  test: {
    include: ["e2e/**/*.e2e.ts"],
    environment: "node",
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: "forks",
    fileParallelism: false,
  },
});
