#!/usr/bin/env node
/**
 * Kinetics engine benchmark: engine vs SciPy, measured side by side in one run.
 *
 * 1. 10,000 ten-point dose-response curves (seeded, invented) written to one CSV; the whole
 *    `analyze dose-response` process (bundled with esbuild into .local/) vs a SciPy curve_fit loop
 *    over the same CSV (bench/scipy_dose_response.py), each a separate process, wall time, median
 *    of --runs (default 5, interleaved); each process's CPU time is reported too. Goal ≥ 10×. SciPy is run plain and again with an analytic Jacobian.
 * 2. Four-model mechanism fits (fitMechanism, bench/engine-mechanism.mjs) vs
 *    scipy.optimize.least_squares (bench/scipy_mechanism.py) on the same data sets: each run a
 *    fresh process on both sides, fitting loop timed (engine cold, JIT compilation included).
 *    Goal ≥ 5×.
 * 3. For the record: in-process 4PL fits per second of the engine's solver and of
 *    ml-levenberg-marquardt 5.1 (the package the stack suggests), on the same curves.
 *
 * usage: node bench/kinetics.mjs [--curves=10000] [--mechanism=1000] [--runs=5]
 * Prints a markdown table; writes its files under .local/bench/ (git-ignored).
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { cpus } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { build } from "esbuild";
import { levenbergMarquardt as mlLevenbergMarquardt } from "ml-levenberg-marquardt";

const ROOT = join(dirname(fileURLToPath(import.meta.url)), "..");
const OUT = join(ROOT, ".local", "bench");
mkdirSync(OUT, { recursive: true });

const arg = (name, fallback) => {
  const a = process.argv.find((x) => x.startsWith(`--${name}=`));
  return a ? Number(a.split("=")[1]) : fallback;
};
const N_CURVES = arg("curves", 10_000);
const N_MECH = arg("mechanism", 1_000);
const RUNS = arg("runs", 5);
const N_ML = Math.min(2_000, N_CURVES);

function log(msg) {
  process.stderr.write(`[bench] ${msg}\n`);
}

// --- bundles ---------------------------------------------------------------------------------
const cliBundle = join(OUT, "analyze.cjs"); // CommonJS: Node loads it a little faster than ESM
const libBundle = join(OUT, "kinetics-lib.mjs");
await build({
  entryPoints: [join(ROOT, "src/cli/analyze.ts")],
  bundle: true,
  platform: "node",
  format: "cjs",
  target: "node20",
  outfile: cliBundle,
  logLevel: "warning",
});
await build({
  stdin: {
    contents: 'export * from "./src/lib/kinetics/index.ts"; export * from "./src/lib/kinetics/testdata/synthetic.ts";',
    resolveDir: ROOT,
    loader: "ts",
  },
  bundle: true,
  platform: "neutral",
  format: "esm",
  target: "node20",
  mainFields: ["module", "main"],
  outfile: libBundle,
  logLevel: "warning",
});
const lib = await import(pathToFileURL(libBundle).href);
log(`bundled ${lib.ENGINE_VERSION} with esbuild into .local/bench/`);

// --- data ------------------------------------------------------------------------------------
const curves = Array.from({ length: N_CURVES }, (_, k) => lib.generateDoseResponseCurve(1_000_000 + k));
const csvPath = join(OUT, `dose-response-${N_CURVES}.csv`);
const csvLines = ["compound,concentration,response"];
for (const c of curves) c.concentration.forEach((x, k) => csvLines.push(`${c.id},${x},${c.response[k]}`));
writeFileSync(csvPath, csvLines.join("\n") + "\n");
const models = lib.INHIBITION_MODELS;
const mechSets = Array.from({ length: N_MECH }, (_, k) => lib.generateMechanismDataset(models[k % 4], 2_000_000 + k));
const mechPath = join(OUT, `mechanism-${N_MECH}.json`);
writeFileSync(mechPath, JSON.stringify(mechSets.map((d) => ({ id: d.id, points: d.points }))));
log(`wrote ${N_CURVES} curves (${csvLines.length - 1} rows) and ${N_MECH} mechanism data sets`);

// --- helpers ---------------------------------------------------------------------------------
/** Runs a command (stdout to outFile) through bench/_timed.py: wall time and the child's CPU time. */
function timeProcess(cmd, args, outFile) {
  const r = spawnSync("python3", [join(ROOT, "bench/_timed.py"), outFile, cmd, ...args], {
    cwd: ROOT,
    encoding: "utf8",
  });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}
const median = (v) => [...v].sort((a, b) => a - b)[v.length >> 1];
const fmt = (s) => (s < 10 ? s.toFixed(2) : s.toFixed(1));
const versions = spawnSync(
  "python3",
  ["-c", "import scipy, numpy, sys; print(scipy.__version__, numpy.__version__, sys.version.split()[0])"],
  { encoding: "utf8" },
);
if (versions.status !== 0) throw new Error("python3 with scipy is needed (apt-get install -y python3-scipy)");
const [scipyVersion, numpyVersion, pythonVersion] = versions.stdout.trim().split(" ");

// --- 1. whole process, dose-response ---------------------------------------------------------
const engineOut = join(OUT, "engine-dose-response.json");
const scipyOut = join(OUT, "scipy-dose-response.json");
const engineRuns = [];
const scipyRuns = [];
const scipyJacRuns = [];
// Interleaved runs, so a burst of load on the shared machine hits every side alike.
for (let r = 0; r < RUNS; r++) {
  engineRuns.push(timeProcess(process.execPath, [cliBundle, "dose-response", csvPath], engineOut));
  scipyRuns.push(timeProcess("python3", [join(ROOT, "bench/scipy_dose_response.py"), csvPath], scipyOut));
  // SciPy again with the analytic Jacobian, to show the comparison does not hinge on finite differences.
  scipyJacRuns.push(
    timeProcess(
      "python3",
      [join(ROOT, "bench/scipy_dose_response.py"), "--analytic-jacobian", csvPath],
      join(OUT, "scipy-dose-response-jac.json"),
    ),
  );
  log(
    `dose-response run ${r + 1}: engine ${fmt(engineRuns[r].wall)} s (CPU ${fmt(engineRuns[r].cpu)} s), SciPy ${fmt(scipyRuns[r].wall)} s (CPU ${fmt(scipyRuns[r].cpu)} s), SciPy with analytic Jacobian ${fmt(scipyJacRuns[r].wall)} s`,
  );
}
const tsxTime = timeProcess(
  join(ROOT, "node_modules/.bin/tsx"),
  [join(ROOT, "src/cli/analyze.ts"), "dose-response", csvPath],
  join(OUT, "engine-dose-response-tsx.json"),
).wall;
const engineRes = JSON.parse(readFileSync(engineOut, "utf8"));
const scipyRes = JSON.parse(readFileSync(scipyOut, "utf8"));
let agree = 0;
engineRes.forEach((e, k) => {
  const s = scipyRes[k];
  if (e.ic50 !== null && s.ic50 !== null && Math.abs(e.ic50 - s.ic50) / s.ic50 < 0.005) agree++;
});
const doseEngine = median(engineRuns.map((t) => t.wall));
const doseScipy = median(scipyRuns.map((t) => t.wall));
const doseScipyJac = median(scipyJacRuns.map((t) => t.wall));
const doseEngineCpu = median(engineRuns.map((t) => t.cpu));
const doseScipyCpu = median(scipyRuns.map((t) => t.cpu));

// --- 2. mechanism, fitting loop (each run a fresh process on both sides) ----------------------
function timedFits(cmd, args) {
  const p = spawnSync(cmd, args, { cwd: ROOT, encoding: "utf8", maxBuffer: 256 * 1024 * 1024 });
  if (p.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed: ${p.stderr}`);
  return JSON.parse(p.stdout);
}
const mechEngineTimes = [];
const mechScipyTimes = [];
let engineMech = null;
let scipyMech = null;
for (let r = 0; r < RUNS; r++) {
  engineMech = timedFits(process.execPath, [join(ROOT, "bench/engine-mechanism.mjs"), libBundle, mechPath]);
  scipyMech = timedFits("python3", [join(ROOT, "bench/scipy_mechanism.py"), mechPath]);
  mechEngineTimes.push(engineMech.seconds);
  mechScipyTimes.push(scipyMech.seconds);
  log(`mechanism run ${r + 1}: engine ${fmt(engineMech.seconds)} s, SciPy ${fmt(scipyMech.seconds)} s`);
}
const sameChoice = engineMech.results.filter((e, k) => e.best === scipyMech.results[k].best).length;
const notWorse = engineMech.results.filter((e, k) =>
  models.every((m) => e.rss[m] <= scipyMech.results[k].rss[m] * (1 + 1e-6)),
).length;
const mechEngine = median(mechEngineTimes);
const mechScipy = median(mechScipyTimes);

// --- 3. in-process 4PL solvers ----------------------------------------------------------------
const sub = curves.slice(0, N_ML);
const fourPlWarm = curves.slice(0, 200);
for (const c of fourPlWarm) lib.fitLogistic4(c.concentration, c.response); // both solvers get a warm-up pass
let t0 = performance.now();
const ours = sub.map((c) => lib.fitLogistic4(c.concentration, c.response));
const oursPerSecond = N_ML / ((performance.now() - t0) / 1000);
const fourPl =
  ([bottom, top, l, h]) =>
  (lx) =>
    bottom + (top - bottom) / (1 + Math.pow(10, h * (lx - l)));
const mlFit = (c) => {
  const lx = c.concentration.map(Math.log10);
  const y = c.response;
  const bottom = Math.min(...y);
  const top = Math.max(...y);
  const falling = y[0] < y[y.length - 1]; // concentrations are listed high → low
  const mid = 0.5 * (bottom + top);
  let k0 = 0;
  y.forEach((v, k) => {
    if (Math.abs(v - mid) < Math.abs(y[k0] - mid)) k0 = k;
  });
  return mlLevenbergMarquardt({ x: lx, y }, fourPl, { initialValues: [bottom, top, lx[k0], falling ? 1 : -1] });
};
for (const c of fourPlWarm) mlFit(c);
t0 = performance.now();
const mlFits = sub.map(mlFit);
const mlPerSecond = N_ML / ((performance.now() - t0) / 1000);
const mlAgree = mlFits.filter(
  (f, k) => Math.abs(Math.pow(10, f.parameterValues[2]) - ours[k].ic50) / ours[k].ic50 < 0.005,
).length;

// --- report ----------------------------------------------------------------------------------
const cpu = cpus()[0]?.model ?? "unknown CPU";
const lines = [
  `Measured ${new Date().toISOString().slice(0, 10)} on ${cpus().length} × ${cpu}; Node ${process.versions.node}, Python ${pythonVersion}, SciPy ${scipyVersion}, NumPy ${numpyVersion}; median of ${RUNS} runs.`,
  "",
  "| task | Inhibitrack engine | SciPy | ratio | goal |",
  "|---|---:|---:|---:|---:|",
  `| ${N_CURVES.toLocaleString("en-US")} ten-point dose-response curves, whole process (\`analyze dose-response\` bundled vs \`curve_fit\` loop over the same CSV), wall time | ${fmt(doseEngine)} s | ${fmt(doseScipy)} s | **${(doseScipy / doseEngine).toFixed(1)}×** | ≥ 10× |`,
  `| the same, CPU time of each process | ${fmt(doseEngineCpu)} s | ${fmt(doseScipyCpu)} s | ${(doseScipyCpu / doseEngineCpu).toFixed(1)}× | — |`,
  `| the same, SciPy given the analytic Jacobian (\`curve_fit(..., jac=...)\`) | ${fmt(doseEngine)} s | ${fmt(doseScipyJac)} s | ${(doseScipyJac / doseEngine).toFixed(1)}× | — |`,
  `| ${N_MECH.toLocaleString("en-US")} mechanism data sets × 4 models (fitting loop in a fresh process, \`fitMechanism\` vs \`least_squares\` with analytic Jacobian) | ${fmt(mechEngine)} s | ${fmt(mechScipy)} s | **${(mechScipy / mechEngine).toFixed(1)}×** | ≥ 5× |`,
  "",
  "| 4PL solver, in process | fits per second | IC50 within 0.5 % of the engine |",
  "|---|---:|---:|",
  `| Inhibitrack engine (own Levenberg–Marquardt, analytic Jacobian, with SEs and CI) | ${Math.round(oursPerSecond).toLocaleString("en-US")} | — |`,
  `| ml-levenberg-marquardt 5.1.0 (defaults, numerical Jacobian, no SEs) | ${Math.round(mlPerSecond).toLocaleString("en-US")} | ${((100 * mlAgree) / N_ML).toFixed(1)} % |`,
  `| SciPy \`curve_fit\` (from the first table, incl. start-up and CSV) | ${Math.round(N_CURVES / doseScipy).toLocaleString("en-US")} | ${((100 * agree) / N_CURVES).toFixed(1)} % |`,
  "",
  `Checks in the same run: the engine's and SciPy's IC50 agree within 0.5 % for ${agree} of ${N_CURVES} curves; the same mechanism is chosen for ${sameChoice} of ${N_MECH} data sets, and the engine's RSS is no worse than SciPy's for every model in ${notWorse} of ${N_MECH}. Through tsx (\`npm run analyze\`, no bundle) the dose-response command took ${fmt(tsxTime)} s.`,
];
process.stdout.write(lines.join("\n") + "\n");
