#!/usr/bin/env node
// `npm test`: its own services on other ports and a fresh database, then typecheck, format check, lint,
// unit + integration tests (vitest, real Postgres), a production build and the end-to-end
// journeys in Debian's chromium. Stops everything it started and ends with one plain line
// `N passed, N failed` that counts every test (typecheck, format, lint and build count as one each).
import { spawn, spawnSync, execFileSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const log = (...a) => console.log("[test]", ...a);
const { root, ensureDependencies } = await import("./lib/stack.mjs");
ensureDependencies(log);
const { startStack, migrate, waitForHttp, portFree } = await import("./lib/stack.mjs");
const { ensureDatabase } = await import("../docker-local-fakes/postgres/postgres.mjs");

const isRoot = process.getuid?.() === 0;
const only = process.argv.slice(2); // e.g. `npm test -- unit e2e`
const want = (step) => only.length === 0 || only.includes(step);

function aptInstall(pkgs) {
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...pkgs], {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
}

function ensureChromium() {
  for (const p of ["/usr/bin/chromium", "/usr/bin/chromium-browser"]) if (fs.existsSync(p)) return p;
  if (!isRoot)
    throw new Error("Debian's chromium is needed for the end-to-end tests: sudo apt-get install -y chromium");
  log("Installing Debian's chromium for the end-to-end tests…");
  aptInstall(["chromium", "fonts-dejavu-core"]);
  return "/usr/bin/chromium";
}

function ensureScipy() {
  if (spawnSync("python3", ["-c", "import scipy"], { stdio: "ignore" }).status === 0) return;
  if (!isRoot)
    throw new Error("SciPy is the reference oracle of the numerical tests: sudo apt-get install -y python3-scipy");
  log("Installing Debian's python3-scipy (reference oracle for the numerical tests)…");
  aptInstall(["python3-scipy"]);
}

function ensureR() {
  const probe = ["-e", "library(minpack.lm); library(robustbase)"];
  if (spawnSync("Rscript", probe, { stdio: "ignore" }).status === 0) return;
  if (!isRoot)
    throw new Error(
      "R is the second reference oracle of the numerical tests: sudo apt-get install -y r-base-core r-cran-minpack.lm r-cran-robustbase",
    );
  log("Installing Debian's R with minpack.lm and robustbase (second reference oracle for the numerical tests)…");
  aptInstall(["r-base-core", "r-cran-minpack.lm", "r-cran-robustbase"]);
}

let passed = 0;
let failed = 0;
const results = [];
function record(name, ok, detail = "") {
  results.push({ name, ok, detail });
  if (ok) passed += 1;
  else failed += 1;
  log(`${ok ? "PASS" : "FAIL"} ${name}${detail ? ` — ${detail}` : ""}`);
}

function runStep(name, cmd, args, env) {
  log(`▶ ${name}`);
  const t0 = Date.now();
  const r = spawnSync(cmd, args, { cwd: root, env, stdio: "inherit" });
  record(name, r.status === 0, `${((Date.now() - t0) / 1000).toFixed(1)} s`);
  return r.status === 0;
}

function runVitest(name, config, env) {
  log(`▶ ${name}`);
  const out = path.join(
    root,
    ".local",
    `vitest-${name}${process.env.TEST_SLOT ? `-${process.env.TEST_SLOT}` : ""}.json`,
  );
  fs.rmSync(out, { force: true });
  const t0 = Date.now();
  const r = spawnSync(
    process.execPath,
    [
      "node_modules/vitest/vitest.mjs",
      "run",
      "--config",
      config,
      "--reporter=default",
      "--reporter=json",
      `--outputFile.json=${out}`,
      ...(process.env.TEST_FILTER ? process.env.TEST_FILTER.split(" ") : []),
    ],
    {
      cwd: root,
      env,
      stdio: "inherit",
    },
  );
  let p = 0;
  let f = 0;
  try {
    const j = JSON.parse(fs.readFileSync(out, "utf8"));
    p = j.numPassedTests ?? 0;
    f = (j.numFailedTests ?? 0) + (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0);
    // A file that fails to load has no tests in it: count the file as one failure.
    for (const s of j.testResults ?? []) if (s.status === "failed" && (s.assertionResults ?? []).length === 0) f += 1;
  } catch {
    f += 1;
  }
  if (r.status !== 0 && f === 0) f = 1;
  passed += p;
  failed += f;
  log(`${name}: ${p} passed, ${f} failed (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
}

// TEST_SLOT=N (0–9) runs a second suite beside the first on other ports and folders.
const slot = Number(process.env.TEST_SLOT ?? 0);
const ports = { pg: 54339 + slot * 100, s3: 4579 + slot * 100, mail: 4035 + slot * 100 };
const appPort = Number(process.env.TEST_APP_PORT ?? 3100 + slot * 100);
let stack;
let app;
let worker;
async function cleanup() {
  if (worker && worker.exitCode === null) {
    worker.kill("SIGTERM");
    await new Promise((r) => {
      const t = setTimeout(() => (worker.kill("SIGKILL"), r()), 8000);
      worker.once("exit", () => (clearTimeout(t), r()));
    });
  }
  if (app && app.exitCode === null) {
    app.kill("SIGTERM");
    await new Promise((r) => {
      const t = setTimeout(() => (app.kill("SIGKILL"), r()), 5000);
      app.once("exit", () => (clearTimeout(t), r()));
    });
  }
  if (stack) await stack.stop();
}
for (const sig of ["SIGINT", "SIGTERM"]) process.on(sig, async () => (await cleanup(), process.exit(130)));

try {
  ensureScipy();
  if (want("unit")) ensureR();
  const chromium = want("e2e") ? ensureChromium() : "";
  const lockPort = await portFree(ports.s3);
  if (!lockPort) throw new Error(`Port ${ports.s3} is in use: is another \`npm test\` running?`);
  stack = await startStack({
    name: slot ? `test${slot}` : "test",
    ports,
    database: "inhibitrack_test",
    freshDatabase: true,
    log,
  });
  const appUrl = `http://127.0.0.1:${appPort}`;
  const env = {
    ...process.env,
    ...stack.env,
    APP_URL: appUrl,
    NEXT_DIST_DIR: slot ? `.next-test${slot}` : ".next-test",
    NEXT_TELEMETRY_DISABLED: "1",
    AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: "true",
    CHROMIUM_PATH: chromium,
    E2E_ARTIFACTS: path.join(root, "artifacts", slot ? `e2e${slot}` : "e2e"),
    NODE_ENV: "test",
  };
  migrate(env);

  if (want("typecheck"))
    runStep(
      "typecheck (tsc --noEmit)",
      process.execPath,
      ["node_modules/typescript/bin/tsc", "--noEmit", "-p", "tsconfig.json"],
      env,
    );
  if (want("format"))
    runStep(
      "format (prettier --check)",
      process.execPath,
      ["node_modules/prettier/bin/prettier.cjs", "--check", "--log-level=warn", "."],
      env,
    );
  if (want("lint"))
    runStep("lint (eslint)", process.execPath, ["node_modules/eslint/bin/eslint.js", "--max-warnings=0", "."], env);
  if (want("unit")) runVitest("unit-and-integration", "vitest.config.ts", env);

  if (want("e2e") || want("build")) {
    const built = runStep(
      "production build (next build)",
      process.execPath,
      ["node_modules/next/dist/bin/next", "build"],
      { ...env, NODE_ENV: "production" },
    );
    if (built && want("e2e")) {
      // The e2e journeys run against the built app with the demo data, in a database of their own.
      const e2eUrl = new URL(env.DATABASE_URL);
      const adminUrl = new URL(env.DATABASE_URL);
      adminUrl.pathname = "/postgres";
      e2eUrl.pathname = `${e2eUrl.pathname}_e2e`;
      await ensureDatabase(adminUrl.toString(), e2eUrl.pathname.slice(1), { fresh: true });
      env.DATABASE_URL = e2eUrl.toString();
      migrate(env);
      const seed = spawnSync(
        process.execPath,
        ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", "src/cli/seed.ts", "--if-empty"],
        { cwd: root, env: { ...env, DEMO_DATA: "1" }, stdio: "inherit" },
      );
      if (seed.status !== 0) throw new Error("Seeding the e2e database failed.");
      app = spawn(
        process.execPath,
        ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(appPort)],
        {
          cwd: root,
          env: { ...env, NODE_ENV: "production", DEMO_DATA: "1" },
          stdio: ["ignore", "inherit", "inherit"],
        },
      );
      // The background worker runs analyses started from the UI, as under `npm start`.
      worker = spawn(
        process.execPath,
        ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.worker.json", "src/cli/worker.ts"],
        {
          cwd: root,
          env: { ...env, NODE_ENV: "production" },
          stdio: ["ignore", "inherit", "inherit"],
        },
      );
      await waitForHttp(`${appUrl}/api/health`, 90_000);
      fs.mkdirSync(env.E2E_ARTIFACTS, { recursive: true });
      runVitest("e2e", "vitest.e2e.config.ts", env);
    }
  }
} catch (e) {
  console.error(e instanceof Error ? e.message : e);
  record("test set-up", false, e instanceof Error ? e.message.split("\n")[0] : String(e));
}
await cleanup();
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed === 0 && passed > 0 ? 0 : 1);
