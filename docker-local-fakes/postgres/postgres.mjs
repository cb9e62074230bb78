// The local PostgreSQL runner: Debian's PostgreSQL binaries, a data folder inside the checkout,
// listening on 127.0.0.1 only. Never a system service. As root the server runs as the
// unprivileged `postgres` OS user (initdb and postgres refuse to run as root).
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import os from "node:os";
import crypto from "node:crypto";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

function findBinDir() {
  const base = "/usr/lib/postgresql";
  if (fs.existsSync(base)) {
    const versions = fs
      .readdirSync(base)
      .filter((v) => fs.existsSync(path.join(base, v, "bin", "initdb")))
      .sort((a, b) => Number(b) - Number(a));
    if (versions[0]) return path.join(base, versions[0], "bin");
  }
  const which = spawnSync("sh", ["-c", "command -v initdb"], { encoding: "utf8" });
  if (which.status === 0 && which.stdout.trim()) return path.dirname(which.stdout.trim());
  return null;
}

/** Finds PostgreSQL's binaries; installs Debian's package when root, else explains what is missing. */
export function ensurePostgresBinaries(log = console.log) {
  let bin = findBinDir();
  if (bin) return bin;
  if (!isRoot) {
    throw new Error(
      "PostgreSQL server binaries (initdb, pg_ctl, postgres) were not found. Install Debian's package `postgresql` (sudo apt-get install -y postgresql), or set DATABASE_URL to an existing server.",
    );
  }
  log("PostgreSQL binaries not found: installing Debian's `postgresql` package (apt-get)…");
  execFileSync("apt-get", ["update", "-qq"], { stdio: "inherit" });
  execFileSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", "postgresql"], {
    stdio: "inherit",
    env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" },
  });
  // Debian's package starts a cluster as a system service; the project never uses it.
  spawnSync(
    "sh",
    [
      "-c",
      "command -v pg_ctlcluster >/dev/null && pg_lsclusters -h 2>/dev/null | awk '{print $1, $2}' | while read v c; do pg_ctlcluster $v $c stop; done",
    ],
    { stdio: "ignore" },
  );
  bin = findBinDir();
  if (!bin) throw new Error("Installed `postgresql` but still found no initdb under /usr/lib/postgresql/*/bin.");
  return bin;
}

function postgresUserCanReach(dir) {
  const r = spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", dir], { stdio: "ignore" });
  return r.status === 0;
}

/**
 * Where the cluster lives. Normally `<checkout>/.local/<name>`; as root, if the `postgres` user
 * cannot enter the checkout (e.g. a clone under /root, mode 0700), a folder under /tmp named
 * after the checkout's path instead.
 */
export function clusterDir(checkout, name, log = console.log) {
  const inside = path.join(checkout, ".local", name);
  if (!isRoot) return inside;
  fs.mkdirSync(path.dirname(inside), { recursive: true });
  if (postgresUserCanReach(path.dirname(inside))) return inside;
  const tag = crypto.createHash("sha256").update(checkout).digest("hex").slice(0, 10);
  const fallback = path.join(os.tmpdir(), `inhibitrack-${path.basename(checkout)}-${tag}`, name);
  log(`Note: the postgres OS user cannot enter ${checkout}; the database folder is ${fallback} instead.`);
  return fallback;
}

function run(bin, args, opts = {}) {
  const cmd = isRoot ? "runuser" : bin;
  const full = isRoot ? ["-u", "postgres", "--", bin, ...args] : args;
  return spawnSync(cmd, full, { encoding: "utf8", ...opts });
}

function chownToPostgres(p) {
  if (isRoot) execFileSync("chown", ["-R", "postgres:postgres", p]);
}

/**
 * Starts (initialising if needed) a cluster in `dir` on 127.0.0.1:`port`.
 * Returns { url(dbName), stop(), alreadyRunning }.
 */
export function startPostgres({ dir, port, user = "inhibitrack", log = console.log }) {
  const bin = ensurePostgresBinaries(log);
  const data = path.join(dir, "data");
  const sock = path.join(dir, "sock");
  const logFile = path.join(dir, "postgres.log");
  fs.mkdirSync(sock, { recursive: true });
  if (isRoot) {
    // Every parent must be enterable by the postgres user.
    fs.chmodSync(dir, 0o755);
  }
  if (!fs.existsSync(path.join(data, "PG_VERSION"))) {
    fs.mkdirSync(data, { recursive: true });
    chownToPostgres(dir);
    const r = run(path.join(bin, "initdb"), [
      "-D",
      data,
      "-U",
      user,
      "--auth=trust",
      "-E",
      "UTF8",
      "--locale=C.UTF-8",
      "--no-sync",
    ]);
    if (r.status !== 0) {
      const r2 = run(path.join(bin, "initdb"), [
        "-D",
        data,
        "-U",
        user,
        "--auth=trust",
        "-E",
        "UTF8",
        "--locale=C",
        "--no-sync",
      ]);
      if (r2.status !== 0) throw new Error(`initdb failed:\n${r.stderr}\n${r2.stderr}`);
    }
    // Loopback only, and a little more room for the test suite's parallel connections.
    fs.appendFileSync(
      path.join(data, "postgresql.conf"),
      "\nlisten_addresses = '127.0.0.1'\nmax_connections = 200\nfsync = off\nsynchronous_commit = off\nfull_page_writes = off\nshared_buffers = 256MB\n",
    );
  }
  chownToPostgres(dir);
  const status = run(path.join(bin, "pg_ctl"), ["-D", data, "status"]);
  let alreadyRunning = false;
  if (status.status === 0) {
    alreadyRunning = true;
  } else {
    const r = run(path.join(bin, "pg_ctl"), [
      "-D",
      data,
      "-o",
      `-k ${sock} -p ${port} -h 127.0.0.1`,
      "-l",
      logFile,
      "-w",
      "-t",
      "60",
      "start",
    ]);
    if (r.status !== 0) {
      let tail = "";
      try {
        tail = fs.readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n");
      } catch {}
      throw new Error(`PostgreSQL did not start on 127.0.0.1:${port}.\n${r.stderr}\n${tail}`);
    }
  }
  return {
    alreadyRunning,
    dataDir: data,
    url: (db) => `postgres://${user}@127.0.0.1:${port}/${db}`,
    stop: () => run(path.join(bin, "pg_ctl"), ["-D", data, "-m", "fast", "-w", "stop"]),
  };
}

/** Creates the database if it does not exist (and drops it first when `fresh`). */
export async function ensureDatabase(adminUrl, name, { fresh = false } = {}) {
  const { default: postgres } = await import("postgres");
  const sql = postgres(adminUrl, { onnotice: () => {}, max: 1 });
  try {
    if (fresh) await sql.unsafe(`drop database if exists "${name}" with (force)`);
    const rows = await sql`select 1 from pg_database where datname = ${name}`;
    if (rows.length === 0) await sql.unsafe(`create database "${name}"`);
  } finally {
    await sql.end();
  }
}
