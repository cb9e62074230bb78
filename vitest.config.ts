import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

export default defineConfig({
  resolve: {
    alias: {
      "@": fileURLToPath(new URL("./src", import.meta.url)),
      "server-only": fileURLToPath(new URL("./src/server/test-server-only.ts", import.meta.url)),
      // Request-scoped Next APIs, held per call by src/test/next-shims.ts.
      "next/headers": fileURLToPath(new URL("./src/test/next-shims.ts", import.meta.url)),
      "next/cache": fileURLToPath(new URL("./src/test/next-shims.ts", import.meta.url)),
    },
  },
  test: {
    include: ["src/**/*.test.ts", "src/**/*.test.tsx"],
    environment: "node",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
    fileParallelism: false,
  },
});
