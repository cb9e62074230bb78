#!/usr/bin/env node
/**
 * Kinetics benchmark: the documented command against SciPy, measured side by side in one run.
 *
 * 1. 10,000 ten-point dose-response curves (seeded, INVENTED) in one CSV: the whole
 *    `npm run -s analyze -- dose-response` process (npm's own start-up included) against a SciPy
 *    curve_fit loop over the same CSV (bench/scipy_dose_response.py), each a fresh process, wall
 *    time, median of --runs (default 5), interleaved so a burst of load on the shared machine hits
 *    both sides alike; CPU time of each process too. Goal ≥ 10×. The command runs with
 *    --weighting=none (its default) so both sides fit the same objective; weighting "auto" (the
 *    app's default) is timed too, and two threads against the default (one thread on 2 cores). SciPy is run plain and with
 *    its analytic Jacobian.
 * 2. 1,000 mechanism data sets (INVENTED) in one batch CSV (compound column): the whole
 *    `npm run -s analyze -- mechanism` process against scipy.optimize.least_squares over the same
 *    CSV (bench/scipy_mechanism.py, four models, AICc, F-test, the same choice rule), whole
 *    process on both sides. Goal ≥ 5×.
 * 3. What the judgement costs (goal: adequacy and robust steps ≤ 30 % of a fit), in process, in
 *    the steady state (a warm-up pass, then the fastest of 7): fitLogistic4 alone against
 *    analyseCurve (adequacy, outcome rules, outlier screen), and the four-model fit alone
 *    against fitMechanism with its adequacy, screens and outlier screen.
 * 4. Start-up of the command: `npm run -s analyze -- --help`, the launcher alone, tsx, and npm's
 *    own floor (`npm -v`), median of 15.
 * 5. For the record: in-process 4PL fits per second of the engine's solver and of
 *    ml-levenberg-marquardt 5.1 (the package the stack suggests), on the same curves.
 *
 * usage: node bench/kinetics.mjs [--curves=10000] [--mechanism=1000] [--runs=5]
 * Prints markdown tables; writes its files under .local/bench/ (git-ignored).
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
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
const N_COST = Math.min(2_000, N_CURVES);

function log(msg) {
  process.stderr.write(`[bench] ${msg}\n`);
}
const load = () =>
  loadavg()
    .map((x) => x.toFixed(1))
    .join(", ");
const loadBefore = load();

// --- the engine in this process (data generation, in-process timings) -----------------------
const libBundle = join(OUT, "kinetics-lib.mjs");
await build({
  stdin: {
    contents: [
      'export * from "./src/lib/kinetics/index.ts";',
      'export * from "./src/lib/kinetics/testdata/synthetic.ts";',
      'export { analyseCurve } from "./src/lib/kinetics/dose-response.ts";',
    ].join("\n"),
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

// The command's own bundle is built (or found fresh) before anything is timed.
const warm = spawnSync(process.execPath, [join(ROOT, "scripts/analyze.cjs"), "--help"], { encoding: "utf8" });
if (warm.status !== 0) throw new Error(`the analyze command does not start: ${warm.stderr}`);

// --- data ------------------------------------------------------------------------------------
// The generator's curves fall (% activity) or rise; the command reads % inhibition, so falling
// curves are written as 100 − y. The IC50 and |Hill| are unchanged by that.
const curves = Array.from({ length: N_CURVES }, (_, k) => {
  const c = lib.generateDoseResponseCurve(1_000_000 + k);
  const falling = c.truth.hill > 0;
  return falling ? { ...c, response: c.response.map((y) => Number((100 - y).toFixed(4))) } : c;
});
const csvPath = join(OUT, `dose-response-${N_CURVES}.csv`);
const csvLines = ["compound,concentration,response (% inhibition)"];
for (const c of curves) c.concentration.forEach((x, k) => csvLines.push(`${c.id},${x},${c.response[k]}`));
writeFileSync(csvPath, csvLines.join("\n") + "\n");
const models = lib.INHIBITION_MODELS;
const mechSets = Array.from({ length: N_MECH }, (_, k) => lib.generateMechanismDataset(models[k % 4], 2_000_000 + k));
const mechPath = join(OUT, `mechanism-${N_MECH}.csv`);
const mechLines = ["compound,substrate,inhibitor,rate"];
for (const d of mechSets) for (const p of d.points) mechLines.push(`${d.id},${p.substrate},${p.inhibitor},${p.rate}`);
writeFileSync(mechPath, mechLines.join("\n") + "\n");
log(
  `wrote ${N_CURVES} curves (${csvLines.length - 1} rows) and ${N_MECH} mechanism data sets (${mechLines.length - 1} rows)`,
);

// --- helpers ---------------------------------------------------------------------------------
/** Runs a command (stdout to outFile) through bench/_timed.py: wall time and the child's CPU time. */
function timeProcess(cmd, args, outFile, env = process.env) {
  const r = spawnSync("python3", [join(ROOT, "bench/_timed.py"), outFile, cmd, ...args], {
    cwd: ROOT,
    encoding: "utf8",
    env,
  });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed (${r.status}): ${r.stderr}`);
  return JSON.parse(r.stdout);
}
const median = (v) => [...v].sort((a, b) => a - b)[v.length >> 1];
const fmt = (s) => (s < 10 ? s.toFixed(2) : s.toFixed(1));
const ms = (s) => `${Math.round(s * 1000)} ms`;
const versions = spawnSync(
  "python3",
  ["-c", "import scipy, numpy, sys; print(scipy.__version__, numpy.__version__, sys.version.split()[0])"],
  { encoding: "utf8" },
);
if (versions.status !== 0) throw new Error("python3 with scipy is needed (apt-get install -y python3-scipy)");
const [scipyVersion, numpyVersion, pythonVersion] = versions.stdout.trim().split(" ");
const npmVersion = spawnSync("npm", ["-v"], { encoding: "utf8" }).stdout.trim();
const analyze = (...args) => ["run", "-s", "analyze", "--", ...args];
const oneThread = { ...process.env, ANALYZE_THREADS: "1" };
// The default is one thread per core but one (one on 2 cores); two threads are timed beside it.
const twoThreads = { ...process.env, ANALYZE_THREADS: "2" };

// --- 1. dose-response, whole process ---------------------------------------------------------
const engineOut = join(OUT, "engine-dose-response.json");
const scipyOut = join(OUT, "scipy-dose-response.json");
const dose = { engine: [], auto: [], single: [], scipy: [], scipyJac: [] };
for (let r = 0; r < RUNS; r++) {
  dose.engine.push(timeProcess("npm", analyze("dose-response", csvPath, "--weighting=none"), engineOut));
  dose.scipy.push(timeProcess("python3", [join(ROOT, "bench/scipy_dose_response.py"), csvPath], scipyOut));
  dose.auto.push(
    timeProcess(
      "npm",
      analyze("dose-response", csvPath, "--weighting=auto"),
      join(OUT, "engine-dose-response-auto.json"),
    ),
  );
  dose.scipyJac.push(
    timeProcess(
      "python3",
      [join(ROOT, "bench/scipy_dose_response.py"), "--analytic-jacobian", csvPath],
      join(OUT, "scipy-dose-response-jac.json"),
    ),
  );
  dose.single.push(
    timeProcess(
      "npm",
      analyze("dose-response", csvPath, "--weighting=none"),
      join(OUT, "engine-dose-response-2.json"),
      twoThreads,
    ),
  );
  log(
    `dose-response run ${r + 1}: command ${fmt(dose.engine[r].wall)} s (CPU ${fmt(dose.engine[r].cpu)} s; defaults ${fmt(dose.auto[r].wall)} s; two threads ${fmt(dose.single[r].wall)} s), SciPy ${fmt(dose.scipy[r].wall)} s (CPU ${fmt(dose.scipy[r].cpu)} s), SciPy with Jacobian ${fmt(dose.scipyJac[r].wall)} s`,
  );
}
const tsxTime = timeProcess(
  join(ROOT, "node_modules/.bin/tsx"),
  [join(ROOT, "src/cli/analyze.ts"), "dose-response", csvPath, "--weighting=none"],
  join(OUT, "engine-dose-response-tsx.json"),
  oneThread,
).wall;
// Where the command's own time goes (ANALYZE_TIMING=1: ms since its process started), median of 3.
const phaseRuns = Array.from({ length: 3 }, () => {
  const r = spawnSync(
    process.execPath,
    [join(ROOT, "scripts/analyze.cjs"), "dose-response", csvPath, "--weighting=none"],
    { cwd: ROOT, encoding: "utf8", env: { ...process.env, ANALYZE_TIMING: "1" }, maxBuffer: 1 << 30 },
  );
  const m = /timing \(ms since start\): (.*)/.exec(r.stderr ?? "");
  if (r.status !== 0 || !m) throw new Error(`the analyze command's timing failed: ${r.stderr}`);
  return Object.fromEntries(m[1].split(", ").map((kv) => [kv.split(" ")[0], Number(kv.split(" ")[1])]));
});
const phase = (k) => median(phaseRuns.map((p) => p[k]));
const engineRes = JSON.parse(readFileSync(engineOut, "utf8"));
const singleRes = readFileSync(join(OUT, "engine-dose-response-2.json"), "utf8");
const sameOutput = singleRes === readFileSync(engineOut, "utf8");
const scipyRes = JSON.parse(readFileSync(scipyOut, "utf8"));
const autoRes = JSON.parse(readFileSync(join(OUT, "engine-dose-response-auto.json"), "utf8"));
let agree = 0;
engineRes.forEach((e, k) => {
  const s = scipyRes[k];
  const ic50 = e.fit?.ic50 ?? null;
  if (ic50 !== null && s.ic50 !== null && Math.abs(ic50 - s.ic50) / s.ic50 < 0.005) agree++;
});
const outcomes = (res) => {
  const c = {};
  for (const e of res) c[e.outcome ?? "error"] = (c[e.outcome ?? "error"] ?? 0) + 1;
  return Object.entries(c)
    .map(([k, v]) => `${k} ${v}`)
    .join(", ");
};
const relativeChosen = autoRes.filter((e) => e.weighting?.used === "relative").length;
const wall = (k) => median(dose[k].map((t) => t.wall));
const cpu = (k) => median(dose[k].map((t) => t.cpu));

// --- 2. mechanism, whole process -------------------------------------------------------------
const mech = { engine: [], auto: [], scipy: [] };
const mechEngineOut = join(OUT, "engine-mechanism.json");
const mechScipyOut = join(OUT, "scipy-mechanism.json");
for (let r = 0; r < RUNS; r++) {
  mech.engine.push(timeProcess("npm", analyze("mechanism", mechPath, "--weighting=none"), mechEngineOut));
  mech.scipy.push(timeProcess("python3", [join(ROOT, "bench/scipy_mechanism.py"), mechPath], mechScipyOut));
  mech.auto.push(
    timeProcess("npm", analyze("mechanism", mechPath, "--weighting=auto"), join(OUT, "engine-mechanism-auto.json")),
  );
  log(
    `mechanism run ${r + 1}: command ${fmt(mech.engine[r].wall)} s (CPU ${fmt(mech.engine[r].cpu)} s; defaults ${fmt(mech.auto[r].wall)} s), SciPy ${fmt(mech.scipy[r].wall)} s (CPU ${fmt(mech.scipy[r].cpu)} s)`,
  );
}
const engineMech = JSON.parse(readFileSync(mechEngineOut, "utf8"));
const scipyMech = JSON.parse(readFileSync(mechScipyOut, "utf8"));
const sameChoice = engineMech.filter((e, k) => e.best === scipyMech[k].best).length;
const notWorse = engineMech.filter((e, k) =>
  models.every((m) => e.models[m].rss <= scipyMech[k].rss[m] * (1 + 1e-6)),
).length;
const labels = (res) => {
  const c = {};
  for (const e of res) c[e.label ?? "error"] = (c[e.label ?? "error"] ?? 0) + 1;
  return Object.entries(c)
    .map(([k, v]) => `${k} ${v}`)
    .join(", ");
};
const autoMech = JSON.parse(readFileSync(join(OUT, "engine-mechanism-auto.json"), "utf8"));
const mWall = (k) => median(mech[k].map((t) => t.wall));
const mCpu = (k) => median(mech[k].map((t) => t.cpu));

// --- 3. what the judgement costs, in process -------------------------------------------------
/**
 * Steady-state cost per item in ms: one warm-up pass over all items (V8 keeps compiling for the
 * first thousand or so), then the fastest of `repeat` timed passes — the minimum, because on a
 * shared machine other work only ever adds time.
 */
function perItem(fn, items, repeat = 7) {
  for (const it of items) fn(it);
  let best = Infinity;
  for (let r = 0; r < repeat; r++) {
    const t0 = performance.now();
    for (const it of items) fn(it);
    best = Math.min(best, (performance.now() - t0) / items.length);
  }
  return best;
}
const costCurves = curves.slice(0, N_COST);
const tFit = perItem((c) => lib.fitLogistic4(c.concentration, c.response), costCurves);
const tCurve = perItem((c) => lib.analyseCurve(c.concentration, c.response, { weighting: "none" }), costCurves);
const tCurveAuto = perItem((c) => lib.analyseCurve(c.concentration, c.response), costCurves);
const costSets = mechSets.slice(0, Math.min(500, N_MECH));
const bare = { weighting: "none", extendedModels: "none", outliers: "never" };
const tMechBare = perItem((d) => lib.fitMechanism(d.points, bare), costSets);
const tMech = perItem((d) => lib.fitMechanism(d.points, { weighting: "none" }), costSets);
const tMechAuto = perItem((d) => lib.fitMechanism(d.points), costSets);
const pct = (a, b) => `${a >= b ? "+" : "−"}${Math.abs(100 * (a / b - 1)).toFixed(0)} %`;

// --- 4. start-up -----------------------------------------------------------------------------
function startup(cmd, args, n = 15) {
  const t = [];
  for (let k = 0; k < n; k++) {
    const t0 = performance.now();
    const r = spawnSync(cmd, args, { cwd: ROOT, stdio: "ignore" });
    if (r.status !== 0) throw new Error(`${cmd} ${args.join(" ")} failed`);
    t.push((performance.now() - t0) / 1000);
  }
  return median(t);
}
const start = {
  npm: startup("npm", analyze("--help")),
  launcher: startup(process.execPath, [join(ROOT, "scripts/analyze.cjs"), "--help"]),
  node: startup(process.execPath, ["-e", ""]),
  npmFloor: startup("npm", ["-v"]),
  tsx: startup(join(ROOT, "node_modules/.bin/tsx"), [join(ROOT, "src/cli/analyze.ts"), "--help"], 5),
};

// --- 5. in-process 4PL solvers ----------------------------------------------------------------
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
const cpuName = cpus()[0]?.model ?? "unknown CPU";
const n = (x) => x.toLocaleString("en-US");
const lines = [
  `Measured ${new Date().toISOString().slice(0, 10)} on ${cpus().length} × ${cpuName}; Node ${process.versions.node}, npm ${npmVersion}, Python ${pythonVersion}, SciPy ${scipyVersion}, NumPy ${numpyVersion}; median of ${RUNS} runs; load average ${loadBefore} before, ${load()} after.`,
  "",
  "| task (whole process, wall time) | `npm run -s analyze` | SciPy | ratio | goal |",
  "|---|---:|---:|---:|---:|",
  `| ${n(N_CURVES)} ten-point dose-response curves, \`dose-response --weighting=none\` vs \`curve_fit\` loop over the same CSV | ${fmt(wall("engine"))} s | ${fmt(wall("scipy"))} s | **${(wall("scipy") / wall("engine")).toFixed(1)}×** | ≥ 10× |`,
  `| the same, CPU time of each process | ${fmt(cpu("engine"))} s | ${fmt(cpu("scipy"))} s | ${(cpu("scipy") / cpu("engine")).toFixed(1)}× | — |`,
  `| the same, SciPy given the analytic Jacobian | ${fmt(wall("engine"))} s | ${fmt(wall("scipyJac"))} s | ${(wall("scipyJac") / wall("engine")).toFixed(1)}× | — |`,
  `| the same with \`--weighting=auto\` (the app's default) | ${fmt(wall("auto"))} s | ${fmt(wall("scipy"))} s | ${(wall("scipy") / wall("auto")).toFixed(1)}× | — |`,
  `| the same on two threads (\`ANALYZE_THREADS=2\`) | ${fmt(wall("single"))} s | ${fmt(wall("scipy"))} s | ${(wall("scipy") / wall("single")).toFixed(1)}× | — |`,
  `| ${n(N_MECH)} mechanism data sets, \`mechanism --weighting=none\` on one batch CSV vs \`least_squares\` (4 models, analytic Jacobian) over the same CSV | ${fmt(mWall("engine"))} s | ${fmt(mWall("scipy"))} s | **${(mWall("scipy") / mWall("engine")).toFixed(1)}×** | ≥ 5× |`,
  `| the same, CPU time of each process | ${fmt(mCpu("engine"))} s | ${fmt(mCpu("scipy"))} s | ${(mCpu("scipy") / mCpu("engine")).toFixed(1)}× | — |`,
  `| the same with \`--weighting=auto\` (the app's default) | ${fmt(mWall("auto"))} s | ${fmt(mWall("scipy"))} s | ${(mWall("scipy") / mWall("auto")).toFixed(1)}× | — |`,
  "",
  "| what the judgement costs, in process (per data set, steady state: fastest of 7 passes after a warm-up pass) | fit alone | with the judgement | extra | goal |",
  "|---|---:|---:|---:|---:|",
  `| dose-response: \`fitLogistic4\` vs \`analyseCurve\` (outcome rules, adequacy, outlier screen), weighting none | ${(1000 * tFit).toFixed(0)} µs | ${(1000 * tCurve).toFixed(0)} µs | ${pct(tCurve, tFit)} | ≤ +30 % |`,
  `| the same with weighting auto (replicate test; relative fits where chosen) | ${(1000 * tFit).toFixed(0)} µs | ${(1000 * tCurveAuto).toFixed(0)} µs | ${pct(tCurveAuto, tFit)} | — |`,
  `| mechanism: the four models alone vs \`fitMechanism\` (adequacy, screens, extended models when called for, outlier screen), weighting none | ${(1000 * tMechBare).toFixed(0)} µs | ${(1000 * tMech).toFixed(0)} µs | ${pct(tMech, tMechBare)} | ≤ +30 % |`,
  `| the same with weighting auto | ${(1000 * tMechBare).toFixed(0)} µs | ${(1000 * tMechAuto).toFixed(0)} µs | ${pct(tMechAuto, tMechBare)} | — |`,
  "",
  "| start-up, median of 15 | wall time |",
  "|---|---:|",
  `| \`npm run -s analyze -- --help\` | ${ms(start.npm)} |`,
  `| \`node scripts/analyze.cjs --help\` (the launcher and the prebuilt bundle, without npm) | ${ms(start.launcher)} |`,
  `| \`node -e ""\` (Node alone) | ${ms(start.node)} |`,
  `| \`npm -v\` (npm alone) | ${ms(start.npmFloor)} |`,
  `| \`tsx src/cli/analyze.ts --help\` (what \`npm run analyze\` ran before, median of 5) | ${ms(start.tsx)} |`,
  "",
  "| 4PL solver, in process | fits per second | IC50 within 0.5 % of the engine |",
  "|---|---:|---:|",
  `| Inhibitrack engine (own Levenberg–Marquardt, analytic Jacobian, with SEs and CI) | ${n(Math.round(oursPerSecond))} | — |`,
  `| ml-levenberg-marquardt 5.1.0 (defaults, numerical Jacobian, no SEs) | ${n(Math.round(mlPerSecond))} | ${((100 * mlAgree) / N_ML).toFixed(1)} % |`,
  `| SciPy \`curve_fit\` (from the first table, incl. start-up and CSV) | ${n(Math.round(N_CURVES / wall("scipy")))} | ${((100 * agree) / N_CURVES).toFixed(1)} % |`,
  "",
  `Checks in the same run: outcomes with --weighting=none: ${outcomes(engineRes)}; the fitted 4PL's IC50 agrees with SciPy's within 0.5 % for ${agree} of ${N_CURVES} curves; with --weighting=auto: ${outcomes(autoRes)}, relative weighting chosen for ${relativeChosen}. Two threads and the default print the same bytes: ${sameOutput ? "yes" : "NO"}. Mechanism: the same standard model is chosen for ${sameChoice} of ${N_MECH} data sets, and the engine's RSS is no worse than SciPy's for every model in ${notWorse} of ${N_MECH}; labels with --weighting=none: ${labels(engineMech)}; with --weighting=auto: ${labels(autoMech)}. Through tsx (no bundle, one thread) the dose-response command took ${fmt(tsxTime)} s.`,
  "",
  `Where the command's time goes (\`node scripts/analyze.cjs dose-response\` on the ${n(N_CURVES)} curves, one thread, ANALYZE_TIMING=1, median of 3, ms since the process started): Node, launcher and bundle loaded at ${phase("started")} ms; file read and parsed at ${phase("read")} ms; ${n(N_CURVES)} analyses and their JSON at ${phase("analysed")} ms; written at ${phase("written")} ms.`,
];
process.stdout.write(lines.join("\n") + "\n");
