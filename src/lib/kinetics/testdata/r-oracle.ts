/**
 * Test helper (Node only, never imported by the engine): runs an R script with Rscript (Debian's
 * r-base-core, with r-cran-minpack.lm and r-cran-robustbase for the robust checks) and returns what
 * it printed. `npm test` installs R when it is missing; here a missing R is a clear failure, never
 * a skip. Data go into the script as R vectors written with 17 significant digits (rVector), and
 * results come back as lines "name v1 v2 …" (readRLines), so no JSON package is needed in R.
 */
import { spawnSync } from "node:child_process";

/** Runs `script` with Rscript (from stdin) and returns its standard output. */
export function runR(script: string): string {
  const out = spawnSync("Rscript", ["--vanilla", "-"], {
    input: script,
    encoding: "utf8",
    maxBuffer: 64 * 1024 * 1024,
  });
  if (out.error)
    throw new Error(
      `Rscript is needed for the R oracle tests: install Debian's r-base-core r-cran-minpack.lm r-cran-robustbase (${out.error.message})`,
    );
  if (out.status !== 0) throw new Error(`Rscript failed (${out.status}): ${out.stderr}`);
  return out.stdout;
}

/** An R numeric vector literal with every digit of each double. */
export function rVector(values: ArrayLike<number>): string {
  const parts: string[] = [];
  for (let i = 0; i < values.length; i++) parts.push(values[i]!.toPrecision(17));
  return `c(${parts.join(", ")})`;
}

/** Parses lines "name v1 v2 …" (numbers; NA and Inf allowed) into a record of arrays. */
export function readRLines(stdout: string): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const line of stdout.split("\n")) {
    const parts = line.trim().split(/\s+/);
    if (parts.length < 2 || parts[0] === "") continue;
    out[parts[0]!] = parts
      .slice(1)
      .map((v) => (v === "NA" ? NaN : v === "Inf" ? Infinity : v === "-Inf" ? -Infinity : Number(v)));
  }
  return out;
}

/** R code that prints `name` followed by the values of `expr` with 17 significant digits. */
export function rPrint(name: string, expr: string): string {
  return `cat(${JSON.stringify(name)}, formatC(as.numeric(${expr}), digits = 17, format = "g"), "\\n")\n`;
}
