// A worker thread that parses uploads (plate reader exports, compound import files) so that a
// hostile file costs this thread's memory and time, not the server's: the pool in
// upload-parse-pool.ts starts it with memory limits and terminates it when a parse runs too long.
// Workbooks pass the zip guard (inflated bytes counted while streaming, row and column caps while
// reading) before exceljs loads them. Plain Node, no "server-only": a worker is outside React's
// server condition. No I/O besides the messages.
import { parentPort } from "node:worker_threads";
import { runUploadParse, type UploadParseTask } from "./upload-parse";

parentPort?.on("message", (msg: { id: number; task: UploadParseTask }) => {
  runUploadParse(msg.task).then(
    (result) => parentPort?.postMessage({ id: msg.id, ok: true, result }),
    (e: unknown) =>
      parentPort?.postMessage({ id: msg.id, ok: false, error: e instanceof Error ? e.message : String(e) }),
  );
});
