// Runs in the browser before the app's own code (Next.js's client instrumentation hook).
// zod 4 probes whether it may compile validators with `new Function("")`; under the pages'
// Content-Security-Policy (no 'unsafe-eval', src/proxy.ts) that probe is refused and reported as
// a violation. Validation in the browser does not need the compiled fast path, so it is off.
import { config } from "zod";

config({ jitless: true });
