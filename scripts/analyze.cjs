#!/usr/bin/env node
// `npm run analyze -- …`: runs the prebuilt bundle of src/cli/analyze.ts, rebuilt first when a
// source is newer (scripts/lib/analyze-bundle.cjs). Usage and output: docs/science.md.
/* eslint-disable @typescript-eslint/no-require-imports -- CommonJS on purpose (it loads faster; this runs before every command) */
"use strict";
// A smaller inlining budget for the optimising compiler, set before any code of the command is
// compiled (it changes how fast V8 gets there, never a result): a batch runs for well under a
// second, most of it while V8 is still compiling, and compiling less inlined code cut the
// command's CPU time by 15–18 % for 10⁴ curves (also on 4·10⁴) and 13 % for 10³ mechanism sets
// (docs/benchmarks.md).
require("node:v8").setFlagsFromString("--max-inlined-bytecode-size-cumulative=150");
const { bundleIsFresh, buildBundle, bundlePath } = require("./lib/analyze-bundle.cjs");

if (bundleIsFresh()) require(bundlePath);
else
  buildBundle().then(
    () => require(bundlePath),
    (e) => {
      process.stderr.write(`error: cannot build the analyze command: ${e.message}\n`);
      process.exitCode = 1;
    },
  );
