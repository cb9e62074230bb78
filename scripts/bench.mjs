#!/usr/bin/env node
// `npm run bench`: every benchmark in bench/ (files named *.ts or *.mjs that are not helpers),
// one after another, against a stack of its own (ports +900, a fresh database), so benchmarks
// that store data measure the real database. `npm run bench -- chem plates` runs only those.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const { root, ensureDependencies } = await import("./lib/stack.mjs");
ensureDependencies();
const { startStack, migrate } = await import("./lib/stack.mjs");

const only = process.argv.slice(2);
const files = fs
  .readdirSync(path.join(root, "bench"))
  .filter((f) => /\.(ts|mjs)$/.test(f) && !f.startsWith("_") && !f.startsWith("engine-"))
  .filter((f) => only.length === 0 || only.some((o) => f.startsWith(o)))
  .sort();

const stack = await startStack({
  name: "bench",
  ports: { pg: 55229, s3: 5469, mail: 4925 },
  database: "inhibitrack_bench",
  freshDatabase: true,
});
const env = {
  ...process.env,
  ...stack.env,
  NEXT_TELEMETRY_DISABLED: "1",
  AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
};
let failed = 0;
try {
  migrate(env);
  for (const f of files) {
    console.log(`\n### bench/${f}\n`);
    const args = f.endsWith(".ts")
      ? ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", `bench/${f}`]
      : [`bench/${f}`];
    const r = spawnSync(process.execPath, args, { cwd: root, env, stdio: "inherit" });
    if (r.status !== 0) failed += 1;
  }
} finally {
  await stack.stop();
}
process.exit(failed ? 1 : 0);
