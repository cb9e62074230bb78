// "Build if needed": a fingerprint of everything `next build` reads. When it matches the one
// saved after the last build, the existing .next is reused.
import fs from "node:fs";
import path from "node:path";
import crypto from "node:crypto";
import { root } from "./stack.mjs";

const inputs = [
  "src",
  "public",
  "next.config.ts",
  "tailwind.config.ts",
  "postcss.config.mjs",
  "tsconfig.json",
  "package-lock.json",
];

function walk(p, out) {
  if (!fs.existsSync(p)) return;
  const st = fs.statSync(p);
  if (st.isDirectory()) {
    for (const f of fs.readdirSync(p).sort()) walk(path.join(p, f), out);
  } else if (!/\.test\.tsx?$/.test(p)) {
    out.push(`${path.relative(root, p)}:${st.size}:${Math.floor(st.mtimeMs)}`);
  }
}

export function sourceFingerprint() {
  const out = [];
  for (const i of inputs) walk(path.join(root, i), out);
  return crypto.createHash("sha256").update(out.join("\n")).digest("hex");
}

const stampFile = () => path.join(root, ".next", "inhibitrack-build-stamp");

export function buildIsCurrent() {
  try {
    return (
      fs.existsSync(path.join(root, ".next", "BUILD_ID")) &&
      fs.readFileSync(stampFile(), "utf8") === sourceFingerprint()
    );
  } catch {
    return false;
  }
}

export function writeBuildStamp() {
  fs.writeFileSync(stampFile(), sourceFingerprint());
}
