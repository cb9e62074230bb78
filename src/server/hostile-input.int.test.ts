// Bad input gives 4xx, never 500: every route handler and server action in the registry
// (src/server/registry.ts) is called with a generated list of hostile path parameters, query
// strings, JSON bodies and form fields — double-encoded percent signs, ids of 36 dashes, NUL
// characters, unpaired surrogates, years 0 and 99999, 1e308 and overflowing numbers, deep
// nesting — as an admin and as a viewer (the guard passes, so the input reaches the handler's own
// code), and no answer may be ≥ 500. The inputs are the ones a probe of the running app found to
// give 500 (issue 15 item 11) plus variants; the expectation "4xx for bad input" is common
// practice for HTTP APIs (RFC 9110 §15.5: client errors are 4xx).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import path from "node:path";
import crypto from "node:crypto";
import { registry } from "./registry";
import { makeWorld, as, callAction, type World, type TestUser } from "@/test/harness";
import { analysesWorld } from "@/test/analyses";
import { stopBoss } from "@/server/jobs/boss";
import { startWorkerHeartbeat } from "@/server/jobs/heartbeat";
import { toPublicError } from "./errors";
import { checkJson, fieldProblem } from "./edge-input";

const HOST = "127.0.0.1:3000";
type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

const DASHES = "-".repeat(36);
/** Path parameter values as Next's router hands them over (already decoded once). */
const hostileParams = [
  "%E0", // from %25E0: decoding again throws URIError
  "%25E0",
  DASHES,
  "a\u0000b",
  "\uD800",
  "x".repeat(5000),
  "../../etc/passwd",
  "' or 1=1 --",
  "00000000-0000-0000-0000-00000000000g",
  "INH-99999999999999999999",
  "99999-01-01",
  "1e308",
];
/** Raw query strings (percent-encoded as a client would send them). */
const hostileQueries = [
  "q=a%00b",
  "search=%00",
  "%00=x",
  "name=%ED%A0%80",
  "lastTestedFrom=99999-01-01",
  "lastTestedTo=%2B099999-01-01",
  "from=0000-01-01",
  "week=99999-W01",
  "page=1e308",
  "pageSize=1e999",
  "limit=-1e308",
  "offset=99999999999999999999",
  "minPki=Infinity",
  "sort=%E0%A4%A",
  `campaignId=${DASHES}`,
  `ids=${DASHES}`,
  `q=${"%25".repeat(3000)}`,
];
/** Raw JSON bodies (and a few that are not JSON). */
const hostileBodies = [
  '{"name":"a\\u0000b","reason":"a\\u0000b","body":"a\\u0000b","status":"a\\u0000b"}',
  '{"value":1e308,"concentrationUm":1e308,"threshold":1e308,"k":1e308}',
  '{"value":1e999,"k":-1e999}',
  '{"date":"99999-01-01","lastTestedFrom":"99999-01-01","since":"+099999-01-01T00:00:00Z"}',
  '{"name":"\\ud800","smiles":"\\udfff"}',
  `{"runIds":["${DASHES}"],"experimentId":"${DASHES}","registryIds":["${DASHES}"],"ids":["${DASHES}"]}`,
  `{"registryId":"%E0","registryIds":["%25E0"],"status":"hit"}`,
  "[".repeat(200) + "]".repeat(200),
  "{",
  "null",
  '"just a string"',
  `{"filters":{"q":"a\\u0000"},"sort":[{"colId":"a\\u0000","sort":"asc"}]}`,
];
/** Form field values for server actions. */
const hostileFields = ["a\u0000b", DASHES, "\uD800", "1e308", "1e999", "99999-01-01", "%E0", "x".repeat(20_000)];

let world: World;
let ids: Record<string, string>;

beforeAll(async () => {
  world = await makeWorld();
  const a = await analysesWorld(world);
  ids = {
    campaignId: world.campaignId,
    experimentId: a.experimentId,
    analysisId: a.analysisId,
    runId: a.runId,
    importId: crypto.randomUUID(),
    viewId: crypto.randomUUID(),
    mapId: crypto.randomUUID(),
    libraryId: crypto.randomUUID(),
    registryId: "INH-000001",
    compoundId: "INH-000001",
    token: "not-a-token",
  };
});
// /api/health is called with hostile queries too: it answers 503 while no worker beats (a true
// answer, not an input error), so a worker's heartbeat row stands in for one here.
let heartbeat: { stop: () => Promise<void> } | undefined;
beforeAll(async () => {
  heartbeat = await startWorkerHeartbeat();
});
afterAll(async () => {
  await heartbeat?.stop();
  await stopBoss();
});

async function call(
  handler: Handler,
  user: TestUser | null,
  method: string,
  urlPath: string,
  params: Record<string, string>,
  body?: string,
): Promise<number> {
  const headers: Record<string, string> = { host: HOST };
  if (method !== "GET") headers.origin = `http://${HOST}`;
  if (body !== undefined) headers["content-type"] = "application/json";
  return as(
    user,
    async () => {
      const req = new Request(`http://${HOST}${urlPath}`, { method, headers, body });
      const res = await handler(req, { params: Promise.resolve(params) });
      return res.status;
    },
    headers,
  );
}

/** encodeURIComponent, except that an unpaired surrogate (which it refuses) becomes its UTF-8 bytes' escapes. */
const urlSafe = (v: string) =>
  encodeURIComponent(v.replace(/[\uD800-\uDFFF]/g, "\uFFFD")).replace(/%EF%BF%BD/g, "%ED%A0%80");

/** The URL path and parameter names of a route file (src/app/api/a/[b]/route.ts → /api/a/{b}). */
function routeShape(file: string): { names: string[]; build: (p: Record<string, string>) => string } {
  const segs = file
    .replace(/^src\/app/, "")
    .replace(/\/route\.ts$/, "")
    .split("/")
    .filter((s) => !/^\(.*\)$/.test(s));
  const names = segs.filter((s) => /^\[.+\]$/.test(s)).map((s) => s.slice(1, -1));
  return {
    names,
    build: (p) => segs.map((s) => (/^\[.+\]$/.test(s) ? urlSafe(p[s.slice(1, -1)] ?? "x") : s)).join("/") || "/",
  };
}

const routeEntries = registry.filter((e) => e.id.includes("/route.ts#"));
const actionEntries = registry.filter((e) => !e.id.includes("/route.ts#"));

describe("edge rules (unit)", () => {
  it("name the field and refuse NUL, bad UUIDs, years 99999, 1e308", () => {
    expect(fieldProblem("q", "a\u0000b")).toMatch(/“q” contains a NUL character/);
    expect(fieldProblem("campaignId", DASHES)).toMatch(/“campaignId” must be a UUID/);
    expect(fieldProblem("from", "99999-01-01")).toMatch(/year 99999/);
    expect(fieldProblem("k", "1e308")).toMatch(/outside the accepted range/);
    expect(fieldProblem("k", "3.5")).toBeNull();
    expect(fieldProblem("from", "2026-12-02")).toBeNull();
    expect(fieldProblem("password", "12345678901234567890")).toBeNull(); // opaque: only NUL and bad text refused
    expect(fieldProblem("password", "a\u0000")).toMatch(/NUL/);
    expect(() => checkJson({ a: [{ b: 1e308 }] })).toThrow(/“a\[0\]\.b” is 1e\+308/);
    expect(() => checkJson({ a: "x\u0000" })).toThrow(/a contains a NUL/);
  });
  it("a Postgres data exception that slips past the edge is a 400, not a 500 (SQLSTATEs from the PostgreSQL manual, appendix A)", () => {
    for (const code of ["22P02", "22021", "22008", "22003", "54000", "22P05"]) {
      const pg = Object.assign(new Error("x"), { code, severity: "ERROR" });
      expect(toPublicError(pg).status).toBe(400);
      expect(toPublicError(Object.assign(new Error("Failed query"), { cause: pg })).status).toBe(400);
    }
    expect(toPublicError(Object.assign(new Error("x"), { code: "40P01", severity: "ERROR" })).status).toBe(500);
  });
});

describe("hostile input at every route handler gives no 5xx", () => {
  it.each(routeEntries.map((e) => [e.id]))("%s", async (id) => {
    const [file, method] = id.split("#") as [string, string];
    const mod = (await import(/* @vite-ignore */ path.resolve(file))) as Record<string, Handler>;
    const handler = mod[method]!;
    const { names, build } = routeShape(file);
    const valid = Object.fromEntries(names.map((n) => [n, ids[n] ?? "x"]));
    const failures: string[] = [];
    let calls = 0;
    for (const user of [world.people.admin, world.people.viewer]) {
      const attempt = async (params: Record<string, string>, query: string, body?: string) => {
        calls++;
        const url = build(params) + (query ? `?${query}` : "");
        const status = await call(handler, user, method, url, params, body);
        if (status >= 500) failures.push(`${status} ${method} ${url.slice(0, 120)} ${body?.slice(0, 80) ?? ""}`);
      };
      for (const q of hostileQueries) await attempt(valid, q);
      for (const n of names)
        for (const v of hostileParams) await attempt({ ...valid, [n]: v }, "", method === "GET" ? undefined : "{}");
      if (method !== "GET") for (const b of hostileBodies) await attempt(valid, "", b);
    }
    expect(failures, `${failures.length} of ${calls} calls answered ≥ 500`).toEqual([]);
  });
});

describe("hostile form fields at every server action give no 5xx", () => {
  const fieldNames = [
    "campaignId",
    "experimentId",
    "analysisId",
    "runId",
    "name",
    "email",
    "reason",
    "value",
    "token",
    "userId",
    "registryId",
    "date",
    "smiles",
  ];
  it.each(actionEntries.map((e) => [e.id]))("%s", async (id) => {
    const [file, name] = id.split("#") as [string, string];
    const mod = (await import(/* @vite-ignore */ path.resolve(file))) as Record<string, unknown>;
    const action = mod[name];
    const failures: string[] = [];
    for (const v of hostileFields) {
      for (const f of fieldNames) {
        const fields: Record<string, string> = { campaignId: world.campaignId, [f]: v };
        try {
          const o = await callAction(action, fields, world.people.admin);
          if (o.kind === "state" && o.state && !o.state.ok && (o.state.status ?? 400) >= 500)
            failures.push(`${o.state.status} ${f}=${JSON.stringify(v.slice(0, 20))}`);
        } catch (e) {
          failures.push(`threw ${f}=${JSON.stringify(v.slice(0, 20))}: ${String(e).slice(0, 120)}`);
        }
      }
    }
    expect(failures).toEqual([]);
  });
});
