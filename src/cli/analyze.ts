/**
 * Batch analysis from the command line.
 *
 *   npm run -s analyze -- mechanism FILE.csv [--weighting=none|relative]
 *   npm run -s analyze -- dose-response FILE.csv [--fix-top=N] [--fix-bottom=N]
 *
 * Prints JSON on stdout. Bad input: one line on stderr naming the line and column, exit code 2,
 * nothing on stdout. Results are for research use and need review by a qualified scientist.
 */
import { readFileSync } from "node:fs";
import {
  ENGINE_VERSION,
  INHIBITION_MODELS,
  TableInputError,
  fitLogistic4,
  finiteOrNull,
  fitMechanism,
  readDoseResponseCsv,
  readMechanismCsv,
  type MechanismModelFit,
} from "../lib/kinetics/index";

const USAGE = `Inhibitrack analyze (${ENGINE_VERSION})

usage:
  analyze mechanism FILE.csv [--weighting=none|relative]
      columns substrate, inhibitor, rate (any order, header case-insensitive, one
      concentration unit). Fits competitive, uncompetitive, noncompetitive and mixed
      inhibition and prints {"best", "label", "models"} as JSON.
  analyze dose-response FILE.csv [--fix-top=N] [--fix-bottom=N]
      columns compound, concentration, response. Fits a four-parameter logistic per
      compound and prints a JSON array in input order.

Bad input prints one line on stderr naming the line and column and exits with code 2.
Results are for research use only and need review by a qualified scientist.
`;

class UsageError extends Error {}

/** JSON with non-finite numbers as null (JSON has no NaN or Infinity). */
function toJson(value: unknown, indent?: number): string {
  return JSON.stringify(value, (_k, v: unknown) => (typeof v === "number" && !Number.isFinite(v) ? null : v), indent);
}

function parseOptions(args: string[], allowed: readonly string[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const a of args) {
    const m = /^--([a-z-]+)=(.*)$/.exec(a);
    if (!m || !allowed.includes(m[1]!))
      throw new UsageError(
        `unknown option ${JSON.stringify(a)} (allowed: ${allowed.map((o) => `--${o}=…`).join(", ") || "none"})`,
      );
    out[m[1]!] = m[2]!;
  }
  return out;
}

function optionNumber(options: Record<string, string>, name: string): number | undefined {
  const raw = options[name];
  if (raw === undefined) return undefined;
  const v = Number(raw);
  if (raw.trim() === "" || !Number.isFinite(v))
    throw new UsageError(`--${name} needs a number (got ${JSON.stringify(raw)})`);
  return v;
}

function modelView(m: MechanismModelFit) {
  return {
    vmax: m.vmax,
    km: m.km,
    kic: m.kic,
    kiu: m.kiu,
    alpha: m.alpha,
    rss: m.rss,
    aicc: m.aicc,
    deltaAicc: m.deltaAicc,
    akaikeWeight: m.akaikeWeight,
    fTestVsMixed: m.fTestVsMixed ? { f: m.fTestVsMixed.f, p: m.fTestVsMixed.p } : null,
    se: { vmax: m.se.vmax, km: m.se.km, kic: m.se.kic, kiu: m.se.kiu },
    ci95: m.ci95,
    dof: m.dof,
    converged: m.converged,
  };
}

function mechanismCommand(text: string, options: Record<string, string>): string {
  const weighting = options.weighting ?? "none";
  if (weighting !== "none" && weighting !== "relative")
    throw new UsageError(`--weighting must be none or relative (got ${JSON.stringify(weighting)})`);
  const rows = readMechanismCsv(text);
  if (weighting === "relative") {
    // Find a non-positive rate at S > 0 before the engine refuses it, so the message names the line.
    const bad = rows.find((p) => p.substrate > 0 && !(p.rate > 0));
    if (bad) throw new TableInputError(bad.line, "rate", `relative weighting needs a positive rate (got ${bad.rate})`);
  }
  const r = fitMechanism(
    rows.map(({ substrate, inhibitor, rate }) => ({ substrate, inhibitor, rate })),
    { weighting },
  );
  const models = Object.fromEntries(INHIBITION_MODELS.map((m) => [m, modelView(r.models[m])]));
  return toJson({ best: r.best, label: r.label, models }, 2) + "\n";
}

function doseResponseCommand(text: string, options: Record<string, string>): string {
  const fixedTop = optionNumber(options, "fix-top");
  const fixedBottom = optionNumber(options, "fix-bottom");
  const free = 2 + (fixedTop === undefined ? 1 : 0) + (fixedBottom === undefined ? 1 : 0);
  const series = readDoseResponseCsv(text, free + 1, Math.max(3, free));
  const lines = series.map((s) => {
    const f = fitLogistic4(s.concentration, s.response, { fixedTop, fixedBottom });
    // Every number passes finiteOrNull, so the plain (fast) JSON.stringify cannot meet NaN.
    return JSON.stringify({
      compound: s.compound,
      ic50: finiteOrNull(f.ic50),
      hill: finiteOrNull(f.hill),
      top: finiteOrNull(f.top),
      bottom: finiteOrNull(f.bottom),
      ic50Ci95: [finiteOrNull(f.ic50Ci95[0]), finiteOrNull(f.ic50Ci95[1])],
      flags: f.flags,
    });
  });
  return "[\n" + lines.join(",\n") + "\n]\n";
}

/** Runs the command on argv (without node and script) and returns stdout; throws on bad input. */
export function runAnalyze(argv: readonly string[], readFile: (path: string) => string): string {
  const [command, file, ...rest] = argv;
  if (command === undefined || command === "--help" || command === "-h" || command === "help") return USAGE;
  if (command !== "mechanism" && command !== "dose-response")
    throw new UsageError(`unknown command ${JSON.stringify(command)}; use mechanism or dose-response (see --help)`);
  if (file === undefined) throw new UsageError(`${command} needs a CSV file (see --help)`);
  let text: string;
  try {
    text = readFile(file);
  } catch (e) {
    throw new UsageError(`cannot read ${file}: ${(e as Error).message}`);
  }
  try {
    if (command === "mechanism") return mechanismCommand(text, parseOptions(rest, ["weighting"]));
    return doseResponseCommand(text, parseOptions(rest, ["fix-top", "fix-bottom"]));
  } catch (e) {
    if (e instanceof TableInputError) throw new UsageError(`${file} ${e.message}`);
    throw e;
  }
}

function main(): void {
  try {
    process.stdout.write(runAnalyze(process.argv.slice(2), (p) => readFileSync(p, "utf8")));
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    process.stderr.write(`error: ${message.replace(/\s*\n\s*/g, " ")}\n`);
    // Bad input and usage errors exit 2; an unexpected failure of the engine exits 1.
    process.exitCode = e instanceof UsageError || e instanceof RangeError ? 2 : 1;
  }
}

main();
