import type { NextConfig } from "next";
import "./src/env";

const nextConfig: NextConfig = {
  // `npm test` builds into its own folder so it never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  serverExternalPackages: ["@node-rs/argon2", "s3rver", "pg-boss"],
  typedRoutes: false,
};

export default nextConfig;
