import type { NextConfig } from "next";
import "./src/env";

/** On every response (pages get their nonce'd Content-Security-Policy from src/proxy.ts). */
const everywhere = [
  { key: "X-Frame-Options", value: "DENY" },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
];

const nextConfig: NextConfig = {
  // `npm test` builds into its own folder so it never disturbs a running `npm start`.
  distDir: process.env.NEXT_DIST_DIR ?? ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  serverExternalPackages: ["@node-rs/argon2", "s3rver", "pg-boss"],
  typedRoutes: false,
  async headers() {
    return [
      { source: "/:path*", headers: everywhere },
      // The API answers JSON, CSV and SVG: nothing in it may run or be framed.
      {
        source: "/api/:path*",
        headers: [
          {
            key: "Content-Security-Policy",
            value: "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'; sandbox",
          },
        ],
      },
    ];
  },
};

export default nextConfig;
