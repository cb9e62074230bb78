// The digest stop link against the real database (invented test people and campaigns): a valid
// link names its campaign only (never an address), an altered, expired or former member's link
// nothing, and the secret is made per installation.
import { describe, it, expect } from "vitest";
import crypto from "node:crypto";
import fs from "node:fs";
import { and, eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { digestOptOuts, memberships } from "@/server/db/schema";
import { callAction, makeWorld } from "@/test/harness";
import * as digestActions from "@/app/(auth)/digest/actions";
import { OPT_OUT_LINK_DAYS, optOutToken, readOptOutToken, stopDigestByLink, stopLinkTarget } from ".";
import { LOCAL_SECRET_FILE } from "./opt-out";

describe("digest stop link", () => {
  it("names the campaign of a valid link and no address; an altered one names nothing", async () => {
    const w = await makeWorld();
    const token = optOutToken(w.people.viewer.id, w.campaignId);
    const target = await stopLinkTarget(token);
    expect(target).toEqual({ campaignName: `Test campaign ${w.tag}` });
    expect(JSON.stringify(target)).not.toContain("@");
    expect(await stopLinkTarget(`${token}x`)).toBeNull();
    expect(await stopLinkTarget("not-a-token")).toBeNull();
  });

  it("expires after 60 days", async () => {
    const w = await makeWorld();
    const issued = new Date(Date.now() - (OPT_OUT_LINK_DAYS * 86_400_000 + 60_000));
    const old = optOutToken(w.people.viewer.id, w.campaignId, issued);
    expect(readOptOutToken(old)).toBeNull();
    expect(readOptOutToken(old, new Date(issued.getTime() + 86_400_000))).not.toBeNull();
    expect(await stopDigestByLink(old)).toBe(false);
  });

  it("does nothing for a person who is no longer a member, or a campaign that is gone", async () => {
    const w = await makeWorld();
    const token = optOutToken(w.people.chemist.id, w.campaignId);
    await db
      .delete(memberships)
      .where(and(eq(memberships.campaignId, w.campaignId), eq(memberships.userId, w.people.chemist.id)));
    expect(await stopLinkTarget(token)).toBeNull();
    const o = await callAction(digestActions.stopDigestAction, { token }, null);
    expect(o.kind === "state" && o.state && !o.state.ok && o.state.error).toMatch(/not valid/);
    const rows = await db.select().from(digestOptOuts).where(eq(digestOptOuts.userId, w.people.chemist.id));
    expect(rows).toHaveLength(0);
    expect(await stopLinkTarget(optOutToken(`gone-${crypto.randomUUID()}`, crypto.randomUUID()))).toBeNull();
  });

  it("stops the digest of a member through the page's action", async () => {
    const w = await makeWorld();
    const o = await callAction(
      digestActions.stopDigestAction,
      { token: optOutToken(w.people.lead.id, w.campaignId) },
      null,
    );
    expect(o.kind === "state" && o.state?.ok).toBe(true);
    const rows = await db.select().from(digestOptOuts).where(eq(digestOptOuts.userId, w.people.lead.id));
    expect(rows.map((r) => r.campaignId)).toEqual([w.campaignId]);
  });

  it("signs with a random secret kept in the local data folder, not a published constant", () => {
    const w = { u: "someone", c: crypto.randomUUID() };
    const token = optOutToken(w.u, w.c);
    const [payload, sig] = token.split(".");
    const known = crypto
      .createHmac("sha256", "inhibitrack-local-development-link-secret")
      .update(payload!)
      .digest("base64url");
    expect(sig).not.toBe(known);
    const stat = fs.statSync(LOCAL_SECRET_FILE);
    expect(stat.mode & 0o077).toBe(0);
    const secret = fs.readFileSync(LOCAL_SECRET_FILE, "utf8").trim();
    expect(secret.length).toBeGreaterThanOrEqual(32);
    // Reference: Node's HMAC-SHA-256 (RFC 2104) of the payload with that secret is the signature.
    expect(crypto.createHmac("sha256", secret).update(payload!).digest("base64url")).toBe(sig);
  });
});
