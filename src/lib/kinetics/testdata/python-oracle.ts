/**
 * Test helper (Node only, never imported by the engine): runs scipy_oracle.py once with a JSON
 * request and returns its JSON answer. When SciPy is missing it installs Debian's python3-scipy
 * if running as root (as CI does); otherwise it fails with a clear message — the oracle tests
 * are never skipped.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

const SCRIPT = fileURLToPath(new URL("./scipy_oracle.py", import.meta.url));

function hasScipy(): boolean {
  return spawnSync("python3", ["-c", "import scipy, numpy"], { stdio: "ignore" }).status === 0;
}

/** Makes sure python3 can import scipy, installing python3-scipy with apt-get as root if needed. */
export function ensureScipy(): void {
  if (hasScipy()) return;
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot)
    throw new Error(
      "SciPy is needed for the oracle tests: install Debian's python3-scipy (apt-get install -y python3-scipy)",
    );
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const install = (): boolean =>
    spawnSync("apt-get", ["install", "-y", "python3-scipy"], { stdio: "inherit", env }).status === 0;
  if (!install()) {
    execFileSync("apt-get", ["update"], { stdio: "inherit", env });
    if (!install()) throw new Error("apt-get install -y python3-scipy failed");
  }
  if (!hasScipy()) throw new Error("python3-scipy installed but `import scipy` still fails");
}

/** Runs the oracle script on `request` (see scipy_oracle.py for the request kinds). */
export function runScipyOracle<T = Record<string, unknown>>(request: Record<string, unknown>): T {
  ensureScipy();
  const out = spawnSync("python3", [SCRIPT], {
    input: JSON.stringify(request),
    encoding: "utf8",
    maxBuffer: 256 * 1024 * 1024,
  });
  if (out.status !== 0) throw new Error(`scipy_oracle.py failed (${out.status}): ${out.stderr}`);
  return JSON.parse(out.stdout) as T;
}
