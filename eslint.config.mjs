import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

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
    files: ["scripts/**", "src/cli/**", "bench/**", "docker-local-fakes/**", "e2e/**", "**/*.test.ts"],
    rules: { "no-console": "off" },
  },
];
export default config;
