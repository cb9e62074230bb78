// Personal API tokens against the real database and the real guard. Reference: issue 16 item 1
// (the API and its rules); SHA-256 of the secret checked against Node's crypto (OpenSSL), the
// format (prefix + 32 random bytes in base64url, RFC 4648 §5) is this product's choice.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import crypto from "node:crypto";
import { and, eq, like, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { apiTokens, auditLog, memberships, throttle, users } from "@/server/db/schema";
import { callAction, callRoute, makeWorld, type TestUser, type World } from "@/test/harness";
import { withRequest } from "@/test/next-shims";
import { stopBoss } from "@/server/jobs/boss";
import { createToken, listTokens, MAX_ACTIVE_TOKENS } from "./index";
import { LAST_USED_RESOLUTION_MS } from "./authenticate";
import * as tokensRoute from "@/app/api/tokens/route";
import * as tokenRoute from "@/app/api/tokens/[tokenId]/route";
import * as hitsRoute from "@/app/api/campaigns/[campaignId]/hits/route";
import * as viewsRoute from "@/app/api/campaigns/[campaignId]/hits/views/route";
import * as plateMapsRoute from "@/app/api/campaigns/[campaignId]/plate-maps/route";
import * as campaignsRoute from "@/app/api/campaigns/route";
import * as meRoute from "@/app/api/me/route";
import * as compoundRoute from "@/app/api/compounds/[registryId]/route";
import { registerCompound } from "@/server/services/compounds";
import { uniqueSmiles } from "@/test/compounds";
import { plateMaps } from "@/server/db/schema";
import * as settingsActions from "@/app/(workspace)/settings/actions";
import { TOKEN_DEFAULT_DAYS } from "@/lib/api-tokens";

const owner = (u: TestUser, globalRole: "admin" | "member" = "member") => ({ ...u, globalRole });
const bearer = (secret: string) => ({ authorization: `Bearer ${secret}` });
/** A route call that carries only the token: no cookie, no Origin. */
const withToken = (
  handler: unknown,
  secret: string,
  opts: { method?: string; path: string; params?: Record<string, string>; body?: unknown },
) => callRoute(handler, { user: null, ...opts, headers: bearer(secret) });

describe("personal API tokens", () => {
  afterAll(() => stopBoss());
  let w: World;
  beforeAll(async () => {
    w = await makeWorld();
  });

  it("POST /api/tokens (session) answers 201 with the secret once; only its SHA-256 is stored; creation is audited", async () => {
    const r = await callRoute(tokensRoute.POST, {
      user: w.people.lead,
      method: "POST",
      path: "/api/tokens",
      body: { name: "Reader PC export script", scope: "read-write", campaignIds: [w.campaignId] },
    });
    expect(r.status).toBe(201);
    const j = r.json as { id: string; token: string; expiresAt: string };
    expect(j.token).toMatch(/^itk_[A-Za-z0-9_-]{43}$/);
    expect(Buffer.from(j.token.slice(4), "base64url")).toHaveLength(32);
    // Default expiry: 90 days from now (within the test's own runtime).
    const days = (Date.parse(j.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(TOKEN_DEFAULT_DAYS - 0.01);
    expect(days).toBeLessThanOrEqual(TOKEN_DEFAULT_DAYS);
    const [row] = await db.select().from(apiTokens).where(eq(apiTokens.id, j.id));
    expect(row!.tokenHash).toBe(crypto.createHash("sha256").update(j.token).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(j.token.slice(4));
    const [a] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "token.create"), eq(auditLog.entityId, j.id)));
    expect(a!.actorId).toBe(w.people.lead.id);
    expect(a!.tokenId).toBeNull(); // made in a browser session
    expect(JSON.stringify(a!.after)).not.toContain(j.token.slice(4));

    const list = await callRoute(tokensRoute.GET, { user: w.people.lead, path: "/api/tokens" });
    const item = (list.json as { items: Record<string, unknown>[] }).items.find((i) => i.id === j.id)!;
    expect(item).toMatchObject({ name: "Reader PC export script", scope: "read-write", status: "active" });
    expect(item.campaigns).toEqual([{ id: w.campaignId, name: `Test campaign ${w.tag}` }]);
    expect(JSON.stringify(list.json)).not.toContain(j.token.slice(4));
  });

  it("refuses bad input with a sentence: over a year, no name, a campaign one is not in, an unknown scope", async () => {
    const post = (body: unknown, user = w.people.viewer) =>
      callRoute(tokensRoute.POST, { user, method: "POST", path: "/api/tokens", body });
    const over = await post({ name: "x", scope: "read", expiresInDays: 366 });
    expect(over.status).toBe(400);
    expect(JSON.stringify(over.json)).toContain("at most 365 days");
    expect((await post({ name: "  ", scope: "read" })).status).toBe(400);
    expect((await post({ name: "x", scope: "admin" })).status).toBe(400);
    const foreign = await post({ name: "x", scope: "read", campaignIds: [w.otherCampaignId] });
    expect(foreign.status).toBe(400);
    expect((foreign.json as { error: string }).error).toBe(`You are not a member of campaign ${w.otherCampaignId}.`);
    expect((await post({ name: "x", scope: "read", expiresInDays: 365 })).status).toBe(201);
  });

  it("a token cannot mint tokens (session only) and needs no Origin; a session request keeps its Origin check", async () => {
    const { token } = await createToken(owner(w.people.assay), { name: "rw", scope: "read-write" });
    const r = await withToken(tokensRoute.POST, token, {
      method: "POST",
      path: "/api/tokens",
      body: { name: "minted by a token", scope: "read-write" },
    });
    expect(r.status).toBe(403);
    expect((r.json as { error: string }).error).toMatch(/API token cannot do this/);
    const crossSite = await callRoute(tokensRoute.POST, {
      user: w.people.assay,
      method: "POST",
      path: "/api/tokens",
      body: { name: "x", scope: "read" },
      headers: { origin: "https://elsewhere.example" },
    });
    expect(crossSite.status).toBe(403);
    expect((crossSite.json as { code: string }).code).toBe("bad_origin");
    // A token write with no Origin at all goes through (a saved view of the hit grid).
    const view = await withToken(viewsRoute.POST, token, {
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/hits/views`,
      params: { campaignId: w.campaignId },
      body: { name: "From a script", state: { columns: [], query: {} } },
    });
    expect(view.status).toBe(201);
  });

  it("a read token reads but never writes, even where the route asks only for membership", async () => {
    const { token } = await createToken(owner(w.people.lead), { name: "read", scope: "read" });
    const read = await withToken(hitsRoute.GET, token, {
      path: `/api/campaigns/${w.campaignId}/hits`,
      params: { campaignId: w.campaignId },
    });
    expect(read.status).toBe(200);
    const write = await withToken(viewsRoute.POST, token, {
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/hits/views`,
      params: { campaignId: w.campaignId },
      body: { name: "Refused", state: { columns: [], query: {} } },
    });
    expect(write.status).toBe(403);
    expect((write.json as { error: string }).error).toBe(
      "This API token is read-only; create a read-write token to make changes.",
    );
  });

  it("a read-write token never exceeds its owner's role (a viewer's token cannot import a plate map)", async () => {
    const { token } = await createToken(owner(w.people.viewer), { name: "rw", scope: "read-write" });
    const form = new FormData();
    form.append("name", "Refused map");
    form.append("format", "96");
    form.append("file", new File(["well,role\n"], "map.csv", { type: "text/csv" }));
    const r = await withToken(plateMapsRoute.POST, token, {
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-maps`,
      params: { campaignId: w.campaignId },
      body: form,
    });
    expect(r.status).toBe(403);
  });

  it("a campaign-limited token gets 404 for the owner's other campaigns", async () => {
    await db.insert(memberships).values({ campaignId: w.otherCampaignId, userId: w.people.lead.id, role: "lead" });
    const { token } = await createToken(owner(w.people.lead), {
      name: "only A",
      scope: "read",
      campaignIds: [w.campaignId],
    });
    const hits = (campaignId: string) =>
      withToken(hitsRoute.GET, token, { path: `/api/campaigns/${campaignId}/hits`, params: { campaignId } });
    expect((await hits(w.campaignId)).status).toBe(200);
    const other = await hits(w.otherCampaignId);
    expect(other.status).toBe(404);
    expect((other.json as { error: string }).error).toBe("No such campaign.");
    // The lists name only the chosen campaign; a session still sees both.
    const listed = await withToken(campaignsRoute.GET, token, { path: "/api/campaigns" });
    expect((listed.json as { items: { id: string }[] }).items.map((c) => c.id)).toEqual([w.campaignId]);
    const me = await withToken(meRoute.GET, token, { path: "/api/me" });
    expect((me.json as { memberships: { campaignId: string }[] }).memberships.map((m) => m.campaignId)).toEqual([
      w.campaignId,
    ]);
    const session = await callRoute(campaignsRoute.GET, { user: w.people.lead, path: "/api/campaigns" });
    expect((session.json as { items: unknown[] }).items).toHaveLength(2);
    await db
      .delete(memberships)
      .where(and(eq(memberships.campaignId, w.otherCampaignId), eq(memberships.userId, w.people.lead.id)));
  });

  it("a campaign-limited token reads only the compounds of its campaigns (a session reads those of all of them)", async () => {
    const world = await makeWorld();
    await db
      .insert(memberships)
      .values({ campaignId: world.otherCampaignId, userId: world.people.viewer.id, role: "viewer" });
    const admin = owner(world.people.admin, "admin");
    const r = await registerCompound(admin, { smiles: uniqueSmiles(), name: `Only on B ${world.tag} (invented)` });
    await db.insert(plateMaps).values({
      campaignId: world.otherCampaignId,
      name: `B map ${world.tag} (invented)`,
      format: 96,
      wells: [{ well: "A1", role: "sample", compound: r.registryId, concentrationUm: 10 }],
      sampleWells: 1,
      neutralWells: 0,
      fullWells: 0,
    });
    const { token } = await createToken(owner(world.people.viewer), {
      name: "only A",
      scope: "read",
      campaignIds: [world.campaignId],
    });
    const opts = { path: `/api/compounds/${r.registryId}`, params: { registryId: r.registryId } };
    expect((await callRoute(compoundRoute.GET, { user: world.people.viewer, ...opts })).status).toBe(200);
    expect((await withToken(compoundRoute.GET, token, opts)).status).toBe(404);
  });

  it("a removed member's token loses the campaign at once; a demoted admin's token loses administration", async () => {
    const world = await makeWorld();
    const { token } = await createToken(owner(world.people.chemist), { name: "rw", scope: "read-write" });
    const hits = () =>
      withToken(hitsRoute.GET, token, {
        path: `/api/campaigns/${world.campaignId}/hits`,
        params: { campaignId: world.campaignId },
      });
    expect((await hits()).status).toBe(200);
    await db
      .delete(memberships)
      .where(and(eq(memberships.campaignId, world.campaignId), eq(memberships.userId, world.people.chemist.id)));
    expect((await hits()).status).toBe(404);

    const admin = await createToken(owner(world.people.admin, "admin"), { name: "admin rw", scope: "read-write" });
    const asAdmin = () =>
      withToken(hitsRoute.GET, admin.token, {
        path: `/api/campaigns/${world.campaignId}/hits`,
        params: { campaignId: world.campaignId },
      });
    expect((await asAdmin()).status).toBe(200);
    await db.update(users).set({ globalRole: "member" }).where(eq(users.id, world.people.admin.id));
    expect((await asAdmin()).status).toBe(404);
  });

  it("revoked, expired and malformed tokens get 401 with a sentence; revocation is immediate, audited and names the token used", async () => {
    const victim = await createToken(owner(w.people.assay), { name: "to revoke", scope: "read" });
    const rw = await createToken(owner(w.people.assay), { name: "revoker", scope: "read-write" });
    const me = (secret: string) => withToken(tokensRoute.GET, secret, { path: "/api/tokens" });
    expect((await me(victim.token)).status).toBe(200);
    const del = await withToken(tokenRoute.DELETE, rw.token, {
      method: "DELETE",
      path: `/api/tokens/${victim.id}`,
      params: { tokenId: victim.id },
    });
    expect(del.status).toBe(200);
    const revoked = await me(victim.token);
    expect(revoked.status).toBe(401);
    expect((revoked.json as { error: string }).error).toMatch(/^This API token was revoked on \d{4}-\d\d-\d\d\.$/);
    const [a] = await db
      .select()
      .from(auditLog)
      .where(and(eq(auditLog.action, "token.revoke"), eq(auditLog.entityId, victim.id)));
    expect(a!.actorId).toBe(w.people.assay.id);
    expect(a!.tokenId).toBe(rw.id);

    // Another person's token is not found, and is left alone.
    const theirs = await createToken(owner(w.people.lead), { name: "lead's", scope: "read" });
    const stranger = await withToken(tokenRoute.DELETE, rw.token, {
      method: "DELETE",
      path: `/api/tokens/${theirs.id}`,
      params: { tokenId: theirs.id },
    });
    expect(stranger.status).toBe(404);
    expect((await me(theirs.token)).status).toBe(200);

    const old = await createToken(owner(w.people.assay), { name: "expired", scope: "read" });
    await db
      .update(apiTokens)
      .set({ expiresAt: sql`now() - interval '1 second'` })
      .where(eq(apiTokens.id, old.id));
    const expired = await me(old.token);
    expect(expired.status).toBe(401);
    expect((expired.json as { error: string }).error).toMatch(/^This API token expired on \d{4}-\d\d-\d\d\./);
    const listed = await listTokens(owner(w.people.assay));
    expect(listed.find((t) => t.id === old.id)!.status).toBe("expired");
    expect(listed.find((t) => t.id === victim.id)!.status).toBe("revoked");

    for (const bad of ["itk_short", `itk_${"A".repeat(43)}`, "", "Basic-looking"]) {
      const r = await me(bad);
      expect(r.status, bad).toBe(401);
      expect((r.json as { error: string }).error).toMatch(/^This API token is not valid\./);
    }
  });

  it("failed token attempts are throttled per address like failed sign-ins (429 once the window is full)", async () => {
    const bad = `itk_${"B".repeat(43)}`;
    expect((await withToken(tokensRoute.GET, bad, { path: "/api/tokens" })).status).toBe(401);
    const bucket = like(throttle.bucket, "signin:address:api-token|%");
    const [row] = await db.select().from(throttle).where(bucket);
    expect(row!.count).toBeGreaterThanOrEqual(1);
    // Fill the window to its limit (300, the sign-in address rule) rather than send 300 requests.
    await db.update(throttle).set({ count: 300 }).where(bucket);
    const r = await withToken(tokensRoute.GET, bad, { path: "/api/tokens" });
    expect(r.status).toBe(429);
    expect((r.json as { error: string }).error).toMatch(/^Too many failed attempts\. Try again in/);
    await db.delete(throttle).where(bucket);
  });

  it("last used is recorded, and written at most once a minute", async () => {
    const t = await createToken(owner(w.people.viewer), { name: "busy", scope: "read" });
    const used = async () => (await db.select().from(apiTokens).where(eq(apiTokens.id, t.id)))[0]!.lastUsedAt;
    expect(await used()).toBeNull();
    await withToken(tokensRoute.GET, t.token, { path: "/api/tokens" });
    const first = await used();
    expect(first).not.toBeNull();
    await withToken(tokensRoute.GET, t.token, { path: "/api/tokens" });
    expect((await used())!.getTime()).toBe(first!.getTime());
    await db
      .update(apiTokens)
      .set({ lastUsedAt: new Date(Date.now() - LAST_USED_RESOLUTION_MS - 1000) })
      .where(eq(apiTokens.id, t.id));
    await withToken(tokensRoute.GET, t.token, { path: "/api/tokens" });
    expect(Date.now() - (await used())!.getTime()).toBeLessThan(30_000);
  });

  it("server actions are browser-only: a bearer token sent to one is ignored (signed out)", async () => {
    const { token } = await createToken(owner(w.people.viewer), { name: "rw", scope: "read-write" });
    const form = new FormData();
    form.append("campaignId", w.campaignId);
    form.append("receive", "0");
    const state = await withRequest({ headers: { host: "127.0.0.1:3000", ...bearer(token) } }, async () =>
      settingsActions.setMyDigestAction(null, form),
    );
    expect(state).toMatchObject({ ok: false, status: 401 });
    // The same person with a session may.
    const ok = await callAction(
      settingsActions.setMyDigestAction,
      { campaignId: w.campaignId, receive: "0" },
      w.people.viewer,
    );
    expect(ok).toMatchObject({ kind: "state", state: { ok: true } });
  });

  it(`holds at most ${MAX_ACTIVE_TOKENS} active tokens per person (409 with a sentence)`, async () => {
    const world = await makeWorld();
    const u = owner(world.people.viewer);
    await db.insert(apiTokens).values(
      Array.from({ length: MAX_ACTIVE_TOKENS }, (_, i) => ({
        userId: u.id,
        name: `filler ${i}`,
        tokenHash: crypto.randomBytes(32).toString("hex"),
        scope: "read" as const,
        expiresAt: new Date(Date.now() + 86_400_000),
      })),
    );
    const r = await callRoute(tokensRoute.POST, {
      user: world.people.viewer,
      method: "POST",
      path: "/api/tokens",
      body: { name: "one too many", scope: "read" },
    });
    expect(r.status).toBe(409);
    expect((r.json as { error: string }).error).toMatch(/Revoke one you no longer use\.$/);
  });
});
