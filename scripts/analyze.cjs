#!/usr/bin/env node
// `npm run analyze -- …`: runs the prebuilt bundle of src/cli/analyze.ts, rebuilt first when a
// source is newer (scripts/lib/analyze-bundle.cjs). Usage and output: docs/science.md.
/* eslint-disable @typescript-eslint/no-require-imports -- CommonJS on purpose (it loads faster; this runs before every command) */
"use strict";
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
