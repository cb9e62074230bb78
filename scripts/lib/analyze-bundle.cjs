// The analyze command ships prebuilt: src/cli/analyze.ts and what it imports, bundled by esbuild
// (it comes with tsx) into one CommonJS file under .local/cli/ (git-ignored). Starting tsx costs
// about half a second per run; Node loads the bundle in a few milliseconds. The bundle is rebuilt
// when any file it was built from (listed by esbuild's metafile) is newer than it, so an edit to
// the engine is picked up on the next run without a separate build step. CommonJS on purpose:
// Node loads it faster than an ES module, and this runs before every command.
/* eslint-disable @typescript-eslint/no-require-imports -- CommonJS on purpose (it loads faster; this runs before every command) */
"use strict";
const fs = require("node:fs");
const path = require("node:path");

const root = path.resolve(__dirname, "../..");
const bundlePath = path.join(root, ".local", "cli", "analyze.cjs");
const manifestPath = `${bundlePath}.inputs.json`;
/** Files that change the bundle without being part of it. */
const buildFiles = [__filename, path.join(root, "tsconfig.json"), path.join(root, "package.json")];

/** True when the bundle exists and no file it was built from is newer. */
function bundleIsFresh() {
  let built;
  let inputs;
  try {
    built = fs.statSync(bundlePath).mtimeMs;
    inputs = JSON.parse(fs.readFileSync(manifestPath, "utf8"));
  } catch {
    return false;
  }
  if (!Array.isArray(inputs)) return false;
  for (const f of buildFiles.concat(inputs)) {
    const s = fs.statSync(f, { throwIfNoEntry: false });
    if (!s || s.mtimeMs > built) return false; // newer, or removed/renamed: rebuild
  }
  return true;
}

/**
 * Builds the bundle (about 0.1–0.3 s). Written under temporary names and renamed into place, so
 * two commands started at once never run a half-written file.
 */
async function buildBundle() {
  const { build } = require("esbuild");
  fs.mkdirSync(path.dirname(bundlePath), { recursive: true });
  const tmp = `${bundlePath}.${process.pid}.tmp`;
  const result = await build({
    entryPoints: [path.join(root, "src/cli/analyze.ts")],
    bundle: true,
    platform: "node",
    format: "cjs",
    target: "node20",
    outfile: tmp,
    metafile: true,
    logLevel: "error",
    absWorkingDir: root,
  });
  const inputs = Object.keys(result.metafile.inputs)
    .filter((f) => !f.startsWith("node_modules/") && !f.includes(":"))
    .map((f) => path.join(root, f));
  fs.writeFileSync(`${manifestPath}.${process.pid}.tmp`, JSON.stringify(inputs));
  fs.renameSync(tmp, bundlePath);
  fs.renameSync(`${manifestPath}.${process.pid}.tmp`, manifestPath);
  return bundlePath;
}

/** The bundle's path, built first when missing or stale. */
async function ensureBundle() {
  if (!bundleIsFresh()) await buildBundle();
  return bundlePath;
}

module.exports = { root, bundlePath, bundleIsFresh, buildBundle, ensureBundle };
