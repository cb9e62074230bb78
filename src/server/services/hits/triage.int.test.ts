// Triage decisions and comments against the real database: who may make them, history and audit
// rows, one transaction for a bulk change, and the grid showing the result. The results are
// INVENTED (src/test/hits.ts), not reference data.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { auditLog, hitComments, hitRows, triageDecisions } from "@/server/db/schema";
import { callRoute, type World } from "@/test/harness";
import { hitsApi, hitsWorld } from "@/test/hits";
import * as hitsRoute from "@/app/api/campaigns/[campaignId]/hits/route";
import * as hitRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/route";
import * as commentsRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/comments/route";
import { stopBoss } from "@/server/jobs/boss";

let w: World;
const { base, list, order } = hitsApi(() => w);

beforeAll(async () => {
  ({ w } = await hitsWorld());
});
afterAll(() => stopBoss());

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
