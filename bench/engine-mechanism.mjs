#!/usr/bin/env node
/**
 * The engine side of the mechanism benchmark, mirroring bench/scipy_mechanism.py: a fresh process
 * reads the data sets, times only the fitting loop (fitMechanism: four models, AICc, F-tests,
 * choice) and prints {"seconds": s, "results": [{id, best, rss}]}. Cold start included: no
 * warm-up pass, so V8's compilation time counts against the engine.
 *
 * usage: node bench/engine-mechanism.mjs LIB_BUNDLE.mjs FILE.json
 */
import { readFileSync } from "node:fs";
import { pathToFileURL } from "node:url";

const [libPath, dataPath] = process.argv.slice(2);
const lib = await import(pathToFileURL(libPath).href);
const datasets = JSON.parse(readFileSync(dataPath, "utf8"));
const t0 = performance.now();
const results = datasets.map((d) => {
  const r = lib.fitMechanism(d.points);
  return { id: d.id, best: r.best, rss: Object.fromEntries(lib.INHIBITION_MODELS.map((m) => [m, r.models[m].rss])) };
});
const seconds = (performance.now() - t0) / 1000;
process.stdout.write(JSON.stringify({ seconds, results }));
