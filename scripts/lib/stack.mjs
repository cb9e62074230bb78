// Brings up what the app needs on this machine: PostgreSQL (Debian's binaries, data inside the
// checkout), the S3 fake and the e-mail fake, each on 127.0.0.1. Used by `npm start`, `npm run dev`
// and `npm test` with different ports and folders. An explicit DATABASE_URL / S3_ENDPOINT /
// RESEND_BASE_URL in the environment means "use that service" and skips the local one.
import { spawn, spawnSync, execFileSync } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { startPostgres, ensureDatabase, clusterDir } from "../../docker-local-fakes/postgres/postgres.mjs";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

export function portFree(port) {
  return new Promise((resolve) => {
    const s = net.createServer();
    s.once("error", () => resolve(false));
    s.once("listening", () => s.close(() => resolve(true)));
    s.listen(port, "127.0.0.1");
  });
}

export async function waitForHttp(url, timeoutMs = 30_000) {
  const until = Date.now() + timeoutMs;
  let lastErr;
  while (Date.now() < until) {
    try {
      const r = await fetch(url);
      if (r.status < 500) return true;
    } catch (e) {
      lastErr = e;
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s${lastErr ? ` (${lastErr.message})` : ""}`);
}

/** Installs dependencies from the lock file when node_modules is missing or older than the lock. */
export function ensureDependencies(log = console.log) {
  const marker = path.join(root, "node_modules", ".package-lock.json");
  const lock = path.join(root, "package-lock.json");
  if (fs.existsSync(marker) && fs.statSync(marker).mtimeMs >= fs.statSync(lock).mtimeMs - 1000) return;
  log("Installing dependencies (npm ci)…");
  execFileSync("npm", ["ci", "--no-audit", "--no-fund", "--loglevel=error"], { cwd: root, stdio: "inherit" });
}

const children = [];

function spawnService(name, args, logFile, env = {}) {
  fs.mkdirSync(path.dirname(logFile), { recursive: true });
  const out = fs.openSync(logFile, "a");
  const child = spawn(process.execPath, args, {
    cwd: root,
    stdio: ["ignore", out, out],
    env: { ...process.env, ...env },
  });
  child.serviceName = name;
  children.push(child);
  return child;
}

/**
 * @param {{name: string, ports: {pg: number, s3: number, mail: number}, database: string, freshDatabase?: boolean, log?: Function}} opts
 * @returns {Promise<{env: Record<string,string>, stop: () => Promise<void>, urls: Record<string,string>}>}
 */
export async function startStack({ name, ports, database, freshDatabase = false, log = console.log }) {
  const localDir = path.join(root, ".local", name);
  fs.mkdirSync(localDir, { recursive: true });
  const env = {};
  const stops = [];

  // PostgreSQL
  if (process.env.DATABASE_URL) {
    env.DATABASE_URL = process.env.DATABASE_URL;
    log(`Database: using DATABASE_URL from the environment.`);
  } else {
    const dir = clusterDir(root, `${name}-postgres`, log);
    const pg = startPostgres({ dir, port: ports.pg, log });
    await ensureDatabase(pg.url("postgres"), database, { fresh: freshDatabase });
    env.DATABASE_URL = pg.url(database);
    if (!pg.alreadyRunning) stops.push(async () => void pg.stop());
  }

  // S3
  if (process.env.S3_ENDPOINT || process.env.S3_USE_AWS === "1") {
    for (const k of ["S3_ENDPOINT", "S3_REGION", "S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"])
      if (process.env[k]) env[k] = process.env[k];
  } else {
    if (!(await portFree(ports.s3)))
      throw new Error(`Port ${ports.s3} (S3 fake) is already in use. Is another Inhibitrack running?`);
    spawnService(
      "s3",
      [
        "docker-local-fakes/s3/server.mjs",
        "--port",
        String(ports.s3),
        "--dir",
        path.join(localDir, "s3"),
        "--bucket",
        "inhibitrack-raw",
      ],
      path.join(localDir, "s3.log"),
    );
    Object.assign(env, {
      S3_ENDPOINT: `http://127.0.0.1:${ports.s3}`,
      S3_REGION: "us-east-1",
      S3_BUCKET: "inhibitrack-raw",
      S3_ACCESS_KEY_ID: "S3RVER",
      S3_SECRET_ACCESS_KEY: "S3RVER",
    });
  }

  // E-mail
  if (process.env.RESEND_BASE_URL || process.env.RESEND_USE_REAL === "1") {
    for (const k of ["RESEND_BASE_URL", "RESEND_API_KEY", "MAIL_FROM"]) if (process.env[k]) env[k] = process.env[k];
  } else {
    if (!(await portFree(ports.mail)))
      throw new Error(`Port ${ports.mail} (e-mail fake) is already in use. Is another Inhibitrack running?`);
    spawnService(
      "mail",
      ["docker-local-fakes/mail/server.mjs", "--port", String(ports.mail), "--dir", path.join(localDir, "mail")],
      path.join(localDir, "mail.log"),
    );
    Object.assign(env, {
      RESEND_BASE_URL: `http://127.0.0.1:${ports.mail}`,
      RESEND_API_KEY: "re_local_fake_key",
      MAIL_OUTBOX_URL: `http://127.0.0.1:${ports.mail}/`,
    });
  }
  if (!process.env.S3_ENDPOINT && process.env.S3_USE_AWS !== "1") await waitForHttp(`${env.S3_ENDPOINT}/`, 30_000);
  if (env.MAIL_OUTBOX_URL) await waitForHttp(`${env.RESEND_BASE_URL}/health`, 30_000);

  const stop = async () => {
    for (const c of children.splice(0)) {
      if (c.exitCode === null) {
        c.kill("SIGTERM");
        await new Promise((r) => {
          const t = setTimeout(() => {
            c.kill("SIGKILL");
            r();
          }, 3000);
          c.once("exit", () => {
            clearTimeout(t);
            r();
          });
        });
      }
    }
    for (const s of stops.splice(0)) await s();
  };
  return { env, stop };
}

/** Runs drizzle's migrator against env.DATABASE_URL. */
export function migrate(env) {
  const r = spawnSync(process.execPath, [path.join(root, "node_modules/tsx/dist/cli.mjs"), "src/cli/migrate.ts"], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: "inherit",
  });
  if (r.status !== 0) throw new Error("Database migration failed (see above).");
}

/** A single-instance lock: a file with our pid; a live pid in it means another start is running. */
export function takeLock(file) {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  if (fs.existsSync(file)) {
    const info = JSON.parse(fs.readFileSync(file, "utf8") || "{}");
    let alive = false;
    try {
      process.kill(info.pid, 0);
      alive = true;
    } catch {}
    if (alive) return info;
  }
  fs.writeFileSync(file, JSON.stringify({ pid: process.pid, startedAt: new Date().toISOString(), ...arguments[1] }));
  return null;
}
