import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";
import drizzle from "eslint-plugin-drizzle";

const config = [
  ...nextVitals,
  ...nextTs,
  {
    ignores: [
      ".next/**",
      ".next-*/**",
      ".local/**",
      "node_modules/**",
      "artifacts/**",
      "drizzle/**",
      "next-env.d.ts",
      "fixtures/**",
    ],
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      // Numbers on screen come from the server; no stray console output in the app.
      "no-console": ["error", { allow: ["warn", "error"] }],
    },
  },
  {
    // An update or delete without a where clause changes every row: refuse it (db and transactions).
    files: ["src/**/*.ts", "src/**/*.tsx"],
    plugins: { drizzle },
    rules: {
      "drizzle/enforce-delete-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
      "drizzle/enforce-update-with-where": ["error", { drizzleObjectName: ["db", "tx"] }],
    },
  },
  {
    // Data flows one way: pages, route handlers and actions call services, never the database.
    files: ["src/app/**/*.ts", "src/app/**/*.tsx"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/server/db", "@/server/db/*", "**/server/db", "**/server/db/*"],
              message: "app/ calls services (src/server/services); only services touch the database.",
            },
          ],
        },
      ],
    },
  },
  {
    // lib/ is pure code shared by server and client: it imports nothing from server/ or app/.
    files: ["src/lib/**/*.ts", "src/lib/**/*.tsx"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/server", "@/server/*", "@/app", "@/app/*", "**/server/*", "**/app/*"],
              message: "lib/ is pure (no I/O): it must not import from server/ or app/.",
            },
          ],
        },
      ],
    },
  },
  {
    files: ["scripts/**", "src/cli/**", "bench/**", "docker-local-fakes/**", "e2e/**", "**/*.test.ts"],
    rules: { "no-console": "off" },
  },
];
export default config;
