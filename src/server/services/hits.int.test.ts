// Hit triage against the real database. The results below are INVENTED (written straight into
// compound_results for a test campaign), not reference data; the checks are on what the product
// does with them: one ranked order everywhere, efficiency figures from their published
// definitions, export neutralisation, and triage permissions with history and audit.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import crypto from "node:crypto";
import ExcelJS from "exceljs";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import {
  analyses,
  auditLog,
  compoundResults,
  compounds,
  experiments,
  hitComments,
  hitRows,
  memberships,
  triageDecisions,
  users,
} from "@/server/db/schema";
import { makeWorld, callRoute, newTestUser, type World } from "@/test/harness";
import { platesWorld, registryIds } from "@/test/plates";
import { analysesWorld } from "@/test/analyses";
import { exportHits, listHits, refreshHitRows } from "./hits";
import { ligandEfficiency, lipophilicEfficiency, pKiFromMicromolar } from "@/lib/hits/efficiency";
import { gridToQuery } from "@/lib/hits/grid-query";
import { hitListSchema, hitQueryString } from "@/lib/hits/query";
import * as hitsRoute from "@/app/api/campaigns/[campaignId]/hits/route";
import * as hitRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/route";
import * as commentsRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/comments/route";
import * as exportRoute from "@/app/api/campaigns/[campaignId]/hits/export/route";
import * as viewsRoute from "@/app/api/campaigns/[campaignId]/hits/views/route";
import { stopBoss } from "@/server/jobs/boss";

type Kind = "single-dose" | "dose-response" | "mechanism";
type Invented = {
  id: string;
  pct?: number;
  ic50?: number;
  ki?: number;
  mech?: string;
  label?: "clear" | "ambiguous";
  flags?: string[];
};

// INVENTED results for INH-000001…INH-000012.
const invented: Invented[] = [
  { id: "INH-000001", pct: 92, ic50: 0.5 },
  { id: "INH-000002", pct: 88, ic50: 0.03, ki: 0.01, mech: "competitive", label: "clear" },
  { id: "INH-000003", pct: 95, ic50: 0.1, flags: ["hill-outside-0.5-2"] },
  { id: "INH-000004", pct: 71 },
  { id: "INH-000005", pct: 80, ic50: 5, ki: 0.5, mech: "mixed", label: "clear" },
  { id: "INH-000006", pct: 85, ic50: 1, ki: 0.05, mech: "noncompetitive", label: "ambiguous" },
  { id: "INH-000007", pct: 90, ic50: 0.2, ki: 0.02, mech: "uncompetitive", label: "clear", flags: ["ki-ci-unbounded"] },
  { id: "INH-000008", pct: -5 },
  { id: "INH-000009", pct: 40, ic50: 2 },
  { id: "INH-000010", pct: 65 },
  { id: "INH-000011", pct: 12 },
  { id: "INH-000012", pct: 99, ic50: 0.03, ki: 0.2, mech: "competitive", label: "clear" },
];

async function addAnalysis(w: World, runId: string, kind: Kind, rows: Invented[]) {
  const [e] = await db
    .insert(experiments)
    .values({ campaignId: w.campaignId, name: `Invented ${kind} ${w.tag}`, kind })
    .returning();
  const inputs = {
    engineVersion: "test",
    kind,
    settings: { resolved: { hitThresholdPct: 50, kmUm: null, enzymeNm: null } },
    runs: [{ id: runId, sha256: "x", fileName: "x", decision: "accepted" }],
    masks: [],
  };
  const [a] = await db
    .insert(analyses)
    .values({
      experimentId: e!.id,
      campaignId: w.campaignId,
      status: "done",
      progress: 1,
      engineVersion: "test",
      inputHash: crypto.randomUUID(),
      inputs,
      isCurrent: true,
      finishedAt: new Date(),
    })
    .returning();
  await db.insert(compoundResults).values(
    rows.map((r) => ({
      analysisId: a!.id,
      experimentId: e!.id,
      campaignId: w.campaignId,
      kind,
      compoundId: r.id,
      nPoints: 4,
      pctInhibition: kind === "single-dose" ? r.pct : null,
      hit: kind === "single-dose" ? (r.pct ?? 0) >= 50 : null,
      ic50Um: kind === "dose-response" ? r.ic50 : null,
      ic50LoUm: kind === "dose-response" ? r.ic50! / 2 : null,
      ic50HiUm: kind === "dose-response" ? r.ic50! * 2 : null,
      hill: kind === "dose-response" ? 1 : null,
      mechanism: kind === "mechanism" ? r.mech : null,
      mechanismLabel: kind === "mechanism" ? r.label : null,
      kiUm: kind === "mechanism" ? r.ki : null,
      kicUm: kind === "mechanism" ? r.ki : null,
      flags:
        (kind === "dose-response" && r.flags?.[0]?.startsWith("hill")) ||
        (kind === "mechanism" && r.flags?.[0]?.startsWith("ki"))
          ? r.flags!
          : [],
      detail: {},
    })),
  );
}

let w: World;
const ids = registryIds(12);
const base = () => `/api/campaigns/${w.campaignId}/hits`;
const list = async (qs: string, user = w.people.lead) =>
  callRoute(hitsRoute.GET, { user, path: `${base()}?${qs}`, params: { campaignId: w.campaignId } });
const order = (j: unknown) => (j as { items: { registryId: string }[] }).items.map((i) => i.registryId);

beforeAll(async () => {
  w = await makeWorld();
  const { runId } = await platesWorld(w);
  await addAnalysis(w, runId, "single-dose", invented);
  await addAnalysis(
    w,
    runId,
    "dose-response",
    invented.filter((r) => r.ic50 !== undefined),
  );
  await addAnalysis(
    w,
    runId,
    "mechanism",
    invented.filter((r) => r.ki !== undefined),
  );
  await db.transaction((tx) => refreshHitRows(tx, w.campaignId, ids));
});
afterAll(() => stopBoss());

describe("hit rows", () => {
  it("are written by runAnalysis in its results transaction", async () => {
    const w2 = await makeWorld();
    await analysesWorld(w2);
    const rows = await db.select().from(hitRows).where(eq(hitRows.campaignId, w2.campaignId));
    expect(rows.map((r) => r.compoundId).sort()).toEqual(ids);
    // The small test plate (src/test/plates.ts): C1 reads 550 between controls at 1000 and 100 → 50 % (science.md worked check).
    expect(rows.find((r) => r.compoundId === "INH-000001")!.pctInhibition).toBeCloseTo(50, 6);
    expect(rows.every((r) => r.lastTestedAt !== null)).toBe(true);
  });

  it("hold pKi, LE and LipE computed from the published definitions (same as src/lib/hits/efficiency.ts)", async () => {
    const [r] = await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000002")));
    const [c] = await db.select().from(compounds).where(eq(compounds.registryId, "INH-000002"));
    // Ki 10 nM → pKi 8 (definition); LE = 1.37·pKi/HA (Hopkins, Groom & Alex 2004); LipE = pKi − cLogP (Leeson & Springthorpe 2007).
    expect(r!.pKi).toBeCloseTo(8, 10);
    expect(r!.le).toBeCloseTo((1.37 * 8) / c!.heavyAtoms, 10);
    expect(r!.le).toBeCloseTo(ligandEfficiency(pKiFromMicromolar(0.01), c!.heavyAtoms)!, 10);
    expect(r!.lipe).toBeCloseTo(lipophilicEfficiency(8, c!.clogp)!, 10);
    expect(r!.mwGPerMol).toBe(c!.mwGPerMol);
    const none = await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000001")));
    expect(none[0]!.le).toBeNull();
  });

  it("rank clean rows by Ki, then IC50, then % inhibition (descending), with flagged or ambiguous rows after them", async () => {
    const r = await list("limit=100");
    expect(r.status).toBe(200);
    // Expected order worked out by hand from the invented table above (common practice for ranking: Ki first).
    expect(order(r.json)).toEqual([
      "INH-000002", // Ki 0.01
      "INH-000012", // Ki 0.2
      "INH-000005", // Ki 0.5
      "INH-000001", // IC50 0.5
      "INH-000009", // IC50 2
      "INH-000004", // 71 %
      "INH-000010", // 65 %
      "INH-000011", // 12 %
      "INH-000008", // −5 %
      "INH-000007", // flagged: Ki 0.02
      "INH-000006", // ambiguous: Ki 0.05
      "INH-000003", // flagged: IC50 0.1
    ]);
    expect((r.json as { total: number }).total).toBe(12);
  });

  it("sort and filter on the server, and say what is wrong with a bad query", async () => {
    const r = await list("sort=ic50&dir=desc&ic50Max=1&limit=3&offset=1");
    expect(order(r.json)).toEqual(["INH-000001", "INH-000007", "INH-000003"]);
    expect((r.json as { total: number }).total).toBe(6);
    const bad = await list("sort=potency");
    expect(bad.status).toBe(400);
    expect((bad.json as { error: string }).error).toMatch(/sort must be one of/);
    const badNum = await list("kiMin=abc");
    expect(badNum.status).toBe(400);
    expect((badNum.json as { error: string }).error).toMatch(/kiMin must be a number/);
  });
});

describe("one query everywhere", () => {
  it("gives the API's items (JSON built in Postgres) exactly as the export's objects", async () => {
    const f = hitListSchema.parse({ sort: "lipe", dir: "desc" });
    const page = await listHits(w.campaignId, f, 100, 0);
    const all = await exportHits(w.campaignId, f);
    expect(page.items).toEqual(all.items);
    expect(page.items.some((i) => i.lastTested !== null && i.ki !== null)).toBe(true);
  });

  it("keeps each row's stored API item in step with the row, whatever writes it (the trigger)", async () => {
    // A write that does not go through refreshHitRows: the trigger still rewrites the stored item.
    await db
      .update(hitRows)
      .set({ ownerName: "Direct Writer (invented)", commentCount: 41 })
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, "INH-000011")));
    const f = hitListSchema.parse({ sort: "registryId", dir: "asc" });
    const page = await listHits(w.campaignId, f, 100, 0);
    const all = await exportHits(w.campaignId, f);
    const item = page.items.find((i) => i.registryId === "INH-000011")!;
    expect(item.owner).toBe("Direct Writer (invented)");
    expect(item.comments).toBe(41);
    expect(page.items).toEqual(all.items);
    await db.transaction((tx) => refreshHitRows(tx, w.campaignId, ["INH-000011"])); // back to what the data says
    const again = (await listHits(w.campaignId, f, 100, 0)).items.find((i) => i.registryId === "INH-000011")!;
    expect(again.comments).not.toBe(41);
  });

  it("gives the same rows from the API, the grid's datasource request and the CSV and XLSX exports", async () => {
    const handWritten = "sort=pctInhibition&dir=desc&mechanism=competitive,mixed,none&ic50Max=3";
    const fromGrid = hitQueryString(
      gridToQuery(
        [{ colId: "pctInhibition", sort: "desc" }],
        { ic50: { filterType: "number", type: "lessThanOrEqual", filter: 3 } },
        { mechanism: ["competitive", "mixed", "none"] },
      ),
      { limit: 100, offset: 0 },
    );
    const api = order((await list(`${handWritten}&limit=100`)).json);
    const grid = order((await list(fromGrid)).json);
    expect(api).toEqual(["INH-000012", "INH-000003", "INH-000001", "INH-000002", "INH-000009"]); // 99, 95, 92, 88, 40 % (invented table)
    expect(grid).toEqual(api);

    const csv = await callRoute(exportRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/export?format=csv&${handWritten}`,
      params: { campaignId: w.campaignId },
    });
    expect(csv.status).toBe(200);
    const lines = (csv.json as string).trim().split("\r\n");
    expect(lines[0]).toContain("Ki (µM)");
    expect(lines[0]).toContain("IC50 (µM)");
    expect(lines[0]).toContain("MW (g/mol)");
    expect(lines[0]).toContain("LE (kcal/mol per heavy atom)");
    expect(lines.slice(1).map((l) => l.split(",")[0])).toEqual(api);

    const x = await callRoute(exportRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/export?format=xlsx&${handWritten}`,
      params: { campaignId: w.campaignId },
    });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(Buffer.from(await x.response.arrayBuffer()) as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Hits")!;
    const got: string[] = [];
    ws.eachRow((row, n) => void (n > 1 && got.push(String(row.getCell(1).value))));
    expect(got).toEqual(api);
  });
});

describe("export neutralises formula-looking text and keeps numbers as numbers", () => {
  it("in CSV and in XLSX (OWASP CSV injection guidance: prefix a single quote)", async () => {
    // An invented lead whose display name looks like a formula becomes the owner of INH-000008.
    const evil = await newTestUser("formula-name");
    await db.update(users).set({ name: '=HYPERLINK("http://x.invalid","a")' }).where(eq(users.id, evil.id));
    await db.insert(memberships).values({ campaignId: w.campaignId, userId: evil.id, role: "lead" });
    const p = await callRoute(hitRoute.PATCH, {
      user: evil,
      method: "PATCH",
      path: `${base()}/INH-000008`,
      params: { campaignId: w.campaignId, registryId: "INH-000008" },
      body: { status: "dropped", comment: "inactive (invented)" },
    });
    expect(p.status).toBe(200);

    const csv = await callRoute(exportRoute.GET, {
      user: w.people.lead,
      path: `${base()}/export?format=csv&q=INH-000008`,
      params: { campaignId: w.campaignId },
    });
    const [header, row] = (csv.json as string).trim().split("\r\n");
    const cols = header!.split(",");
    expect(row).toContain(`"'=HYPERLINK(""http://x.invalid"",""a"")"`);
    // −5 % stays a number, not text with a quote.
    const pctAt = cols.indexOf("Single-dose inhibition (%)");
    expect(pctAt).toBeGreaterThan(0);
    expect(row).toMatch(/,-5,/);

    const x = await callRoute(exportRoute.GET, {
      user: w.people.lead,
      path: `${base()}/export?format=xlsx&q=INH-000008`,
      params: { campaignId: w.campaignId },
    });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(Buffer.from(await x.response.arrayBuffer()) as unknown as ArrayBuffer);
    const ws = wb.getWorksheet("Hits")!;
    const headers = (ws.getRow(1).values as unknown[]).slice(1).map(String);
    const cell = (name: string) => ws.getRow(2).getCell(headers.indexOf(name) + 1).value;
    expect(cell("Owner")).toBe('\'=HYPERLINK("http://x.invalid","a")');
    expect(cell("Single-dose inhibition (%)")).toBe(-5);
    expect(typeof cell("MW (g/mol)")).toBe("number");
  });
});

describe("triage", () => {
  const counts = async (id: string) => {
    const [d] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(triageDecisions)
      .where(and(eq(triageDecisions.campaignId, w.campaignId), eq(triageDecisions.compoundId, id)));
    const [a] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(auditLog)
      .where(and(eq(auditLog.campaignId, w.campaignId), eq(auditLog.entityId, id)));
    const [r] = await db
      .select()
      .from(hitRows)
      .where(and(eq(hitRows.campaignId, w.campaignId), eq(hitRows.compoundId, id)));
    return { decisions: d!.n, audits: a!.n, status: r!.status };
  };
  const patch = (user: World["people"][keyof World["people"]], id: string, body: unknown) =>
    callRoute(hitRoute.PATCH, {
      user,
      method: "PATCH",
      path: `${base()}/${id}`,
      params: { campaignId: w.campaignId, registryId: id },
      body,
    });

  it("a viewer's and a chemist's PATCH are refused (403) and change nothing", async () => {
    const before = await counts("INH-000002");
    expect((await patch(w.people.viewer, "INH-000002", { status: "advance" })).status).toBe(403);
    expect((await patch(w.people.chemist, "INH-000002", { status: "advance" })).status).toBe(403);
    expect((await patch(w.people.assay, "INH-000002", { status: "advance" })).status).toBe(403);
    expect(await counts("INH-000002")).toEqual(before);
  });

  it("a lead's change keeps history (who, when, from, to, comment) and an audit row, and shows in the grid", async () => {
    const r = await patch(w.people.lead, "INH-000002", {
      status: "confirmed",
      comment: "clean competitive, potent (invented)",
    });
    expect(r.status).toBe(200);
    const r2 = await patch(w.people.lead, "INH-000002", { status: "advance" });
    expect(r2.status).toBe(200);
    const hist = await db
      .select()
      .from(triageDecisions)
      .where(and(eq(triageDecisions.campaignId, w.campaignId), eq(triageDecisions.compoundId, "INH-000002")))
      .orderBy(triageDecisions.at);
    expect(hist.map((h) => [h.fromStatus, h.toStatus, h.by])).toEqual([
      ["unreviewed", "confirmed", w.people.lead.id],
      ["confirmed", "advance", w.people.lead.id],
    ]);
    expect(hist[0]!.comment).toBe("clean competitive, potent (invented)");
    const audits = await db
      .select()
      .from(auditLog)
      .where(
        and(
          eq(auditLog.campaignId, w.campaignId),
          eq(auditLog.entityId, "INH-000002"),
          eq(auditLog.action, "triage.status"),
        ),
      );
    expect(audits.map((a) => (a.after as { status: string }).status)).toEqual(["confirmed", "advance"]);
    const g = await list("status=advance");
    expect(order(g.json)).toEqual(["INH-000002"]);
    expect((g.json as { items: { owner: string }[] }).items[0]!.owner).toBe(w.people.lead.name);
    const detail = await callRoute(hitRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/INH-000002`,
      params: { campaignId: w.campaignId, registryId: "INH-000002" },
    });
    expect((detail.json as { history: { to: string }[] }).history.map((h) => h.to)).toEqual(["advance", "confirmed"]);
  });

  it("a bulk change is one transaction: an unknown compound refuses all of it", async () => {
    const before = await counts("INH-000004");
    const held = async () => (await list("status=on-hold")).json as { total: number };
    expect((await held()).total).toBe(0); // the total is now kept until the rows change
    const bad = await callRoute(hitsRoute.PATCH, {
      user: w.people.lead,
      method: "PATCH",
      path: base(),
      params: { campaignId: w.campaignId },
      body: { registryIds: ["INH-000004", "INH-999999"], status: "on hold" },
    });
    expect(bad.status).toBe(400);
    expect((bad.json as { error: string }).error).toContain("INH-999999");
    expect(await counts("INH-000004")).toEqual(before);
    const ok = await callRoute(hitsRoute.PATCH, {
      user: w.people.admin,
      method: "PATCH",
      path: base(),
      params: { campaignId: w.campaignId },
      body: { registryIds: ["INH-000004", "INH-000010"], status: "on hold", comment: "wait for resynthesis" },
    });
    expect(ok.status).toBe(200);
    expect((await counts("INH-000004")).status).toBe("on-hold");
    expect((await counts("INH-000010")).status).toBe("on-hold");
    expect((await held()).total).toBe(2); // not the kept 0: the change moved the campaign's version
  });

  it("chemists comment, viewers cannot; the grid counts comments", async () => {
    const post = (user: World["people"]["viewer"]) =>
      callRoute(commentsRoute.POST, {
        user,
        method: "POST",
        path: `${base()}/INH-000005/comments`,
        params: { campaignId: w.campaignId, registryId: "INH-000005" },
        body: { body: "resynthesis planned (invented)" },
      });
    expect((await post(w.people.viewer)).status).toBe(403);
    expect((await post(w.people.chemist)).status).toBe(201);
    const [c] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(hitComments)
      .where(eq(hitComments.campaignId, w.campaignId));
    expect(c!.n).toBe(1);
    const g = await list("commentsMin=1");
    expect(order(g.json)).toEqual(["INH-000005"]);
  });
});

describe("saved views", () => {
  it("are per person: saved, replaced by name, invisible to others", async () => {
    const save = (user: World["people"]["viewer"], name: string, sort: string) =>
      callRoute(viewsRoute.POST, {
        user,
        method: "POST",
        path: `${base()}/views`,
        params: { campaignId: w.campaignId },
        body: { name, state: { columns: [{ colId: "le", hide: true }], query: { sort } } },
      });
    expect((await save(w.people.viewer, "Potent first", "ki")).status).toBe(201);
    expect((await save(w.people.viewer, "potent FIRST", "le")).status).toBe(201);
    const mine = await callRoute(viewsRoute.GET, {
      user: w.people.viewer,
      path: `${base()}/views`,
      params: { campaignId: w.campaignId },
    });
    const items = (mine.json as { items: { name: string; state: { query: { sort: string } } }[] }).items;
    expect(items).toHaveLength(1);
    expect(items[0]!.state.query.sort).toBe("le");
    const theirs = await callRoute(viewsRoute.GET, {
      user: w.people.chemist,
      path: `${base()}/views`,
      params: { campaignId: w.campaignId },
    });
    expect((theirs.json as { items: unknown[] }).items).toHaveLength(0);
  });
});
