// Campaigns, thresholds, digest schedule, team, audit log and one's own digest through the JSON
// API, against real Postgres and the e-mail fake: happy path, bad input and wrong role for each.
// People and campaigns are invented; the role rules are the roles table of the product design
// (docs/product.md), the team's visibility that of the team page.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { callRoute, makeWorld, newTestUser, outbox, type TestUser, type World } from "@/test/harness";
import { addMember } from "@/server/services/campaigns";
import { stopBoss } from "@/server/jobs/boss";
import * as campaignsRoute from "@/app/api/campaigns/route";
import * as thresholdsRoute from "../thresholds/route";
import * as digestRoute from "../digest/route";
import * as membersRoute from "./route";
import * as memberRoute from "./[userId]/route";
import * as auditRoute from "@/app/api/audit/route";
import * as myDigestRoute from "@/app/api/me/digest/route";
import { PostMemberResponse } from "./schema";
import { GetAuditResponse } from "@/app/api/audit/schema";
import { GetMyDigestResponse } from "@/app/api/me/digest/schema";
import { ThresholdsResponse } from "../thresholds/schema";

type Json = Record<string, unknown>;
let w: World;
const path = (rest = "") => `/api/campaigns/${w.campaignId}${rest}`;
const params = () => ({ campaignId: w.campaignId });

async function lastAudit(action: string): Promise<Json | undefined> {
  const r = await callRoute(auditRoute.GET, {
    user: w.people.admin,
    path: `/api/audit?campaignId=${w.campaignId}&action=${encodeURIComponent(action)}&limit=1`,
  });
  return (r.json as { items: Json[] }).items[0];
}

beforeAll(async () => {
  w = await makeWorld();
});
afterAll(() => stopBoss());

describe("campaigns", () => {
  it("an admin creates a campaign (201, audited); it is then listed for the admin", async () => {
    const r = await callRoute(campaignsRoute.POST, {
      user: w.people.admin,
      method: "POST",
      path: "/api/campaigns",
      body: {
        name: `API campaign ${w.tag} (invented)`,
        targetEnzyme: "Invented kinase",
        kmValue: 12,
        kmUnit: "µM",
        timeZone: "Europe/Berlin",
      },
    });
    expect(r.status).toBe(201);
    const { id } = r.json as { id: string };
    const list = await callRoute(campaignsRoute.GET, { user: w.people.admin, path: "/api/campaigns" });
    expect((list.json as { items: Json[] }).items.some((c) => c.id === id)).toBe(true);
  });

  it("bad input: no target, an unknown time zone, Z′ over 1, an unknown field — 400 naming the field", async () => {
    const post = (body: unknown) =>
      callRoute(campaignsRoute.POST, { user: w.people.admin, method: "POST", path: "/api/campaigns", body });
    const cases: [unknown, string][] = [
      [{ name: "X" }, "targetEnzyme"],
      [{ name: "X", targetEnzyme: "E", timeZone: "Mars/Olympus" }, "timeZone"],
      [{ name: "X", targetEnzyme: "E", qcMinZPrime: 1.5 }, "qcMinZPrime"],
      [{ name: "X", targetEnzyme: "E", owner: "me" }, "owner"],
    ];
    for (const [body, field] of cases) {
      const r = await post(body);
      expect(r.status, JSON.stringify(body)).toBe(400);
      expect((r.json as { error: string }).error).toContain(field);
    }
  });

  it("wrong role: a project lead may not create a campaign (403)", async () => {
    const r = await callRoute(campaignsRoute.POST, {
      user: w.people.lead,
      method: "POST",
      path: "/api/campaigns",
      body: { name: "Refused (invented)", targetEnzyme: "E" },
    });
    expect(r.status).toBe(403);
  });
});

describe("thresholds and digest schedule", () => {
  it("a lead changes one threshold; the others keep their value; audited with the values before", async () => {
    const before = (
      await callRoute(thresholdsRoute.GET, { user: w.people.viewer, path: path("/thresholds"), params: params() })
    ).json as Json;
    const r = await callRoute(thresholdsRoute.PATCH, {
      user: w.people.lead,
      method: "PATCH",
      path: path("/thresholds"),
      params: params(),
      body: { hitThresholdPct: 35 },
    });
    expect(r.status).toBe(200);
    ThresholdsResponse.parse(r.json);
    expect(r.json).toMatchObject({
      qcMinZPrime: before.qcMinZPrime,
      qcMaxCvPct: before.qcMaxCvPct,
      hitThresholdPct: 35,
      units: { qcMaxCvPct: "%", hitThresholdPct: "% inhibition" },
    });
    expect(await lastAudit("campaign.thresholds")).toMatchObject({
      before: { hitThresholdPct: before.hitThresholdPct },
      after: { hitThresholdPct: 35 },
    });
  });

  it("thresholds: bad values 400 naming the field; an assay scientist 403; a non-member 404", async () => {
    const patch = (user: TestUser, body: unknown) =>
      callRoute(thresholdsRoute.PATCH, { user, method: "PATCH", path: path("/thresholds"), params: params(), body });
    for (const [body, field] of [
      [{ qcMinZPrime: -2 }, "qcMinZPrime"],
      [{ qcMaxCvPct: 0 }, "qcMaxCvPct"],
      [{ hitThresholdPct: "50" }, "hitThresholdPct"],
    ] as const) {
      const r = await patch(w.people.lead, body);
      expect(r.status).toBe(400);
      expect((r.json as { error: string }).error).toContain(field);
    }
    expect((await patch(w.people.lead, {})).status).toBe(400);
    expect((await patch(w.people.assay, { hitThresholdPct: 40 })).status).toBe(403);
    expect((await patch(w.people.nonMember, { hitThresholdPct: 40 })).status).toBe(404);
  });

  it("digest schedule: a lead moves it to Friday 16:00 New York time (audited); bad weekday, hour or zone 400; a chemist 403", async () => {
    const patch = (user: TestUser, body: unknown) =>
      callRoute(digestRoute.PATCH, { user, method: "PATCH", path: path("/digest"), params: params(), body });
    const r = await patch(w.people.lead, { digestWeekday: 5, digestHour: 16, timeZone: "America/New_York" });
    expect(r.status).toBe(200);
    expect(r.json).toEqual({ digestWeekday: 5, digestHour: 16, timeZone: "America/New_York" });
    const hourOnly = await patch(w.people.lead, { digestHour: 9 });
    expect(hourOnly.json).toEqual({ digestWeekday: 5, digestHour: 9, timeZone: "America/New_York" });
    expect(await lastAudit("digest.schedule")).toMatchObject({ before: { digestHour: 16 }, after: { digestHour: 9 } });
    for (const [body, field] of [
      [{ digestWeekday: 0 }, "digestWeekday"],
      [{ digestHour: 24 }, "digestHour"],
      [{ timeZone: "Nowhere/Town" }, "timeZone"],
    ] as const) {
      const bad = await patch(w.people.lead, body);
      expect(bad.status).toBe(400);
      expect((bad.json as { error: string }).error).toContain(field);
    }
    expect((await patch(w.people.chemist, { digestHour: 8 })).status).toBe(403);
  });
});

describe("team", () => {
  it("GET: a lead sees ids, e-mails and invitations; a viewer names and roles only", async () => {
    const lead = await callRoute(membersRoute.GET, { user: w.people.lead, path: path("/members"), params: params() });
    expect(lead.status).toBe(200);
    const li = lead.json as { items: Json[]; invitations: Json[] | null };
    expect(li.items.find((m) => m.userId === w.people.viewer.id)).toMatchObject({
      email: w.people.viewer.email,
      role: "viewer",
    });
    expect(Array.isArray(li.invitations)).toBe(true);
    const viewer = await callRoute(membersRoute.GET, {
      user: w.people.viewer,
      path: path("/members"),
      params: params(),
    });
    expect(viewer.status).toBe(200);
    const text = JSON.stringify(viewer.json);
    for (const p of Object.values(w.people)) {
      expect(text).not.toContain(p.email);
      expect(text).not.toContain(p.id);
    }
    expect(text).toContain(w.people.lead.name);
    expect((viewer.json as { invitations: unknown }).invitations).toBeNull();
    expect(
      (await callRoute(membersRoute.GET, { user: w.people.nonMember, path: path("/members"), params: params() }))
        .status,
    ).toBe(404);
  });

  it("an admin invites by e-mail: 201 with the invitation, an e-mail with a one-time link, an audit row, and it is pending", async () => {
    const email = `api-invite-${w.tag}@test.invalid`;
    const r = await callRoute(membersRoute.POST, {
      user: w.people.admin,
      method: "POST",
      path: path("/members"),
      params: params(),
      body: { email: email.toUpperCase(), role: "chemist" },
    });
    expect(r.status).toBe(201);
    const j = PostMemberResponse.parse(r.json); // the documented answer shape
    expect(j).toMatchObject({ email, role: "chemist" });
    const hours = (Date.parse(j.expiresAt) - Date.now()) / 3600_000;
    expect(hours).toBeGreaterThan(71.9);
    expect(hours).toBeLessThanOrEqual(72);
    expect((await outbox()).some((m) => m.to.includes(email) && /\/invite\//.test(m.text ?? ""))).toBe(true);
    expect(await lastAudit("invitation.create")).toMatchObject({
      entityId: j.invitationId,
      after: { email, role: "chemist" },
    });
    const list = await callRoute(membersRoute.GET, { user: w.people.admin, path: path("/members"), params: params() });
    expect((list.json as { invitations: Json[] }).invitations.some((i) => i.id === j.invitationId)).toBe(true);
  });

  it("invite: a bad e-mail or role 400; a lead 403 (only administrators manage the team)", async () => {
    const post = (user: TestUser, body: unknown) =>
      callRoute(membersRoute.POST, { user, method: "POST", path: path("/members"), params: params(), body });
    expect((await post(w.people.admin, { email: "not-an-address", role: "viewer" })).status).toBe(400);
    const role = await post(w.people.admin, { email: `x-${w.tag}@test.invalid`, role: "owner" });
    expect(role.status).toBe(400);
    expect((role.json as { error: string }).error).toContain("role");
    expect((await post(w.people.lead, { email: `y-${w.tag}@test.invalid`, role: "viewer" })).status).toBe(403);
  });

  it("an admin changes a role and removes a member (both audited); a non-member target 404; a lead 403", async () => {
    const u = await newTestUser("api-team");
    await addMember({ ...w.people.admin, globalRole: "admin" }, w.campaignId, u.id, "viewer");
    const p = { campaignId: w.campaignId, userId: u.id };
    const patch = (user: TestUser, body: unknown, pp = p) =>
      callRoute(memberRoute.PATCH, { user, method: "PATCH", path: path(`/members/${pp.userId}`), params: pp, body });
    const r = await patch(w.people.admin, { role: "assay" });
    expect(r.status).toBe(200);
    expect(r.json).toEqual({ userId: u.id, role: "assay" });
    expect(await lastAudit("membership.role")).toMatchObject({
      entityId: u.id,
      before: { role: "viewer" },
      after: { role: "assay" },
    });
    expect((await patch(w.people.admin, { role: "boss" })).status).toBe(400);
    expect((await patch(w.people.lead, { role: "lead" })).status).toBe(403);
    const stranger = await newTestUser("api-team-stranger");
    expect((await patch(w.people.admin, { role: "viewer" }, { ...p, userId: stranger.id })).status).toBe(404);

    const del = (user: TestUser) =>
      callRoute(memberRoute.DELETE, { user, method: "DELETE", path: path(`/members/${u.id}`), params: p });
    expect((await del(w.people.lead)).status).toBe(403);
    const gone = await del(w.people.admin);
    expect(gone.status).toBe(200);
    expect(await lastAudit("membership.remove")).toMatchObject({ entityId: u.id, before: { role: "assay" } });
    expect((await del(w.people.admin)).status).toBe(404);
    const list = await callRoute(membersRoute.GET, { user: w.people.admin, path: path("/members"), params: params() });
    expect((list.json as { items: Json[] }).items.some((m) => m.userId === u.id)).toBe(false);
  });
});

describe("audit log", () => {
  it("pages newest first with a total; filters by action and actor; bad paging 400; a lead 403", async () => {
    const page = async (qs: string) =>
      (await callRoute(auditRoute.GET, { user: w.people.admin, path: `/api/audit?campaignId=${w.campaignId}&${qs}` }))
        .json as { items: Json[]; total: number };
    const all = await page("limit=200");
    GetAuditResponse.parse(all);
    expect(all.total).toBe(all.items.length);
    expect(all.total).toBeGreaterThanOrEqual(5);
    const ats = all.items.map((i) => i.at as string);
    expect([...ats].sort().reverse()).toEqual(ats);
    const first = await page("limit=2&offset=0");
    const second = await page("limit=2&offset=2");
    expect(first.items.map((i) => i.id)).toEqual(all.items.slice(0, 2).map((i) => i.id));
    expect(second.items.map((i) => i.id)).toEqual(all.items.slice(2, 4).map((i) => i.id));
    const byAction = await page("action=membership");
    expect(byAction.items.length).toBeGreaterThan(0);
    expect(byAction.items.every((i) => String(i.action).includes("membership"))).toBe(true);
    const byActor = await page(`actor=${encodeURIComponent(w.people.lead.email)}`);
    expect(byActor.items.every((i) => i.actorEmail === w.people.lead.email)).toBe(true);
    for (const qs of ["limit=0", "limit=201", "offset=-1", "campaignId=nope", "colour=red"]) {
      const r = await callRoute(auditRoute.GET, { user: w.people.admin, path: `/api/audit?${qs}` });
      expect(r.status, qs).toBe(400);
    }
    expect((await callRoute(auditRoute.GET, { user: w.people.lead, path: "/api/audit" })).status).toBe(403);
    expect((await callRoute(auditRoute.GET, { user: null, path: "/api/audit" })).status).toBe(401);
  });
});

describe("my digest", () => {
  it("a viewer stops and resumes their own digest of a campaign; GET shows it; each is audited", async () => {
    const me = w.people.viewer;
    const put = (user: TestUser, body: unknown) =>
      callRoute(myDigestRoute.PUT, { user, method: "PUT", path: "/api/me/digest", body });
    const get = async () =>
      GetMyDigestResponse.parse((await callRoute(myDigestRoute.GET, { user: me, path: "/api/me/digest" })).json).items;
    expect(await get()).toEqual([{ campaignId: w.campaignId, campaignName: `Test campaign ${w.tag}`, receive: true }]);
    const off = await put(me, { campaignId: w.campaignId, receive: false });
    expect(off.status).toBe(200);
    expect((await get())[0]!.receive).toBe(false);
    expect(await lastAudit("digest.opt_out")).toMatchObject({ entityId: me.id, after: { via: "settings" } });
    await put(me, { campaignId: w.campaignId, receive: true });
    expect((await get())[0]!.receive).toBe(true);
    expect(await lastAudit("digest.opt_in")).toMatchObject({ entityId: me.id });

    expect((await put(me, { campaignId: w.campaignId, receive: "no" })).status).toBe(400);
    expect((await put(me, { campaignId: "x", receive: true })).status).toBe(400);
    // Another campaign's digest is not theirs to set.
    expect((await put(me, { campaignId: w.otherCampaignId, receive: false })).status).toBe(404);
  });
});
