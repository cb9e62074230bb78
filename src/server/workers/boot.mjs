// Entry of a worker thread: registers tsx (a dependency) so the worker runs the same TypeScript
// source as the server, then loads the worker module named in workerData.file.
import { workerData } from "node:worker_threads";
import { pathToFileURL } from "node:url";
import { register } from "tsx/esm/api";

register();
await import(pathToFileURL(workerData.file).href);
