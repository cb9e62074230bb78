#!/usr/bin/env node
// A local stand-in for Amazon S3 (s3rver). The app reaches it only through @aws-sdk/client-s3;
// real S3 is a matter of S3_ENDPOINT / credentials, not code.
// Usage: node docker-local-fakes/s3/server.mjs --port 4569 --dir .local/s3 --bucket inhibitrack-raw
import S3rver from "s3rver";
import fs from "node:fs";
import path from "node:path";

const args = Object.fromEntries(
  process.argv.slice(2).reduce((acc, a, i, all) => (a.startsWith("--") ? [...acc, [a.slice(2), all[i + 1]]] : acc), []),
);
const port = Number(args.port ?? process.env.S3_FAKE_PORT ?? 4569);
const dir = path.resolve(args.dir ?? process.env.S3_FAKE_DIR ?? ".local/s3");
const bucket = args.bucket ?? process.env.S3_BUCKET ?? "inhibitrack-raw";
fs.mkdirSync(dir, { recursive: true });

const server = new S3rver({
  port,
  address: args.host ?? "127.0.0.1",
  directory: dir,
  silent: true,
  configureBuckets: [{ name: bucket }],
  // s3rver's default credentials; the app sends these only to the fake.
  allowMismatchedSignatures: false,
});

const { address, port: boundPort } = await server.run();
console.log(`s3 fake listening on http://${address}:${boundPort} (bucket ${bucket}, data in ${dir})`);
for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, () => server.close().then(() => process.exit(0)));
