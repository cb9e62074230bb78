#!/usr/bin/env node
// `npm start` (and `npm run dev` with --dev): everything from a fresh clone to a running app
// with demo data. Ctrl-C stops everything this command started.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const dev = process.argv.includes("--dev");
const startedAt = Date.now();
const log = (...a) => console.log("[inhibitrack]", ...a);

// Dependencies first: the rest of this script imports them.
const { root, ensureDependencies } = await import("./lib/stack.mjs");
ensureDependencies(log);
const { startStack, migrate, takeLock, portFree, waitForHttp } = await import("./lib/stack.mjs");
const { buildIsCurrent, writeBuildStamp } = await import("./lib/build-stamp.mjs");

const port = Number(process.env.PORT ?? 3000);
const appUrl = process.env.APP_URL ?? `http://127.0.0.1:${port}`;
const lockFile = path.join(root, ".local", "start.lock");
const held = takeLock(lockFile, { url: appUrl });
if (held) {
  console.error(
    `Inhibitrack is already running from this folder (pid ${held.pid}, started ${held.startedAt}) at ${held.url ?? "its port"}.\n` +
      `Use that one, or stop it with Ctrl-C in its terminal (or: kill ${held.pid}) before starting another.`,
  );
  process.exit(1);
}
if (!(await portFree(port))) {
  fs.rmSync(lockFile, { force: true });
  console.error(
    `Port ${port} on 127.0.0.1 is already in use by another program. Set PORT to another port, e.g. PORT=3001 npm start.`,
  );
  process.exit(1);
}

const children = [];
let stack;
let stopping = false;
async function shutdown(code = 0) {
  if (stopping) return;
  stopping = true;
  log("Stopping…");
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
  await Promise.all(
    children.map(
      (c) =>
        new Promise((r) => {
          if (c.exitCode !== null) return r();
          const t = setTimeout(() => (c.kill("SIGKILL"), r()), 5000);
          c.once("exit", () => (clearTimeout(t), r()));
        }),
    ),
  );
  if (stack) await stack.stop();
  fs.rmSync(lockFile, { force: true });
  log("Stopped.");
  process.exit(code);
}
/**
 * The background worker, restarted whenever it exits (a crash, an out-of-memory kill, kill -9)
 * with a growing delay — 1 s, 2 s, 4 s … up to 30 s — that starts again from 1 s once a worker
 * has stayed up for a minute, so a worker that cannot start does not spin. Analyses it was
 * running are queued again by the next worker (their heartbeat stops).
 */
function superviseWorker(tsx, env) {
  let delayMs = 1000;
  const launch = () => {
    if (stopping) return;
    const started = Date.now();
    const worker = spawn(process.execPath, [tsx, "--tsconfig", "tsconfig.worker.json", "src/cli/worker.ts"], {
      cwd: root,
      env,
      stdio: "inherit",
    });
    children.push(worker);
    worker.on("exit", (code, signal) => {
      children.splice(children.indexOf(worker), 1);
      if (stopping) return;
      if (Date.now() - started > 60_000) delayMs = 1000;
      console.error(
        `[inhibitrack] The worker exited (${signal ?? `code ${code}`}); restarting it in ${delayMs / 1000} s.`,
      );
      setTimeout(launch, delayMs);
      delayMs = Math.min(30_000, delayMs * 2);
    });
  };
  launch();
}

process.on("SIGINT", () => shutdown(0));
process.on("SIGTERM", () => shutdown(0));
process.on("SIGHUP", () => shutdown(0));

try {
  log("Starting PostgreSQL, the S3 fake and the e-mail fake on 127.0.0.1…");
  stack = await startStack({ name: "dev", ports: { pg: 54329, s3: 4569, mail: 4025 }, database: "inhibitrack", log });
  const env = {
    ...process.env,
    ...stack.env,
    APP_URL: appUrl,
    DEMO_DATA: process.env.DEMO_DATA ?? "1",
    NEXT_TELEMETRY_DISABLED: "1",
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
  };
  migrate(env);
  const tsx = path.join(root, "node_modules/tsx/dist/cli.mjs");
  const seed = spawnSync(process.execPath, [tsx, "--conditions=react-server", "src/cli/seed.ts", "--if-empty"], {
    cwd: root,
    env,
    stdio: "inherit",
  });
  if (seed.status !== 0) throw new Error("Loading the demo data failed (see above).");

  const next = path.join(root, "node_modules/next/dist/bin/next");
  if (!dev) {
    if (buildIsCurrent()) {
      log("The production build is up to date.");
    } else {
      log("Building the app (next build, about a minute)…");
      const b = spawnSync(process.execPath, [next, "build"], {
        cwd: root,
        env: { ...env, NODE_ENV: "production" },
        stdio: "inherit",
      });
      if (b.status !== 0) throw new Error("next build failed (see above).");
      writeBuildStamp();
    }
  }
  const app = spawn(process.execPath, [next, dev ? "dev" : "start", "-H", "127.0.0.1", "-p", String(port)], {
    cwd: root,
    env: { ...env, NODE_ENV: dev ? "development" : "production" },
    stdio: "inherit",
  });
  children.push(app);
  app.on("exit", (code) => {
    if (!stopping) {
      console.error(`The app server exited (code ${code}).`);
      shutdown(1);
    }
  });
  if (fs.existsSync(path.join(root, "src/cli/worker.ts"))) superviseWorker(tsx, env);
  await waitForHttp(`${appUrl}/api/health`, 120_000);
  console.log(`
  Inhibitrack is running (ready ${((Date.now() - startedAt) / 1000).toFixed(0)} s after \`npm start\`).

    App          ${appUrl}
    Health       ${appUrl}/api/health
    Outbox       ${stack.env.MAIL_OUTBOX_URL ?? "(real e-mail service configured)"}
    S3 fake      ${stack.env.S3_ENDPOINT ?? "(real S3 configured)"}

  Demo sign-ins (invented people; password for all: ${"inhibitrack-demo"}):
    admin@example.org    admin
    lead@example.org     project lead
    chemist@example.org  medicinal chemist
    assay@example.org    assay scientist
    viewer@example.org   viewer (member of one campaign only)

  Research use only: results must be reviewed by a qualified scientist.
  Press Ctrl-C to stop everything this command started.
`);
} catch (e) {
  console.error(`\n${e instanceof Error ? e.message : e}\n`);
  await shutdown(1);
}
