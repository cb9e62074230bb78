// Sending the weekly digest against the real database and the e-mail fake's outbox
// (GET /__outbox): content of a seeded (invented) week, never twice per week even when sends race,
// and failed sends retried with backoff.
import { describe, it, expect } from "vitest";
import crypto from "node:crypto";
import { eq, and } from "drizzle-orm";
import { db } from "@/server/db/client";
import { digestSends, memberships, users } from "@/server/db/schema";
import { makeWorld, outbox, TEST_PASSWORD } from "@/test/harness";
import { smallMap, smallExport, campaignRow } from "@/test/plates";
import { analysesWorld } from "@/test/analyses";
import { hashPassword } from "@/server/auth/password";
import { createPlateMap, uploadRun } from "../plates";
import { gatherDigest, sendCampaignDigest } from ".";

const mailsTo = async (since: number, campaignName: string) =>
  (await outbox()).slice(since).filter((m) => m.subject.includes(campaignName));

describe("weekly digest", () => {
  it("sums up a seeded week, sends one per member, and nothing new the second time", async () => {
    const w = await makeWorld();
    await analysesWorld(w); // an accepted run and a single-dose analysis: INH-000001 at 50 % inhibition is a hit
    const campaign = await campaignRow(w.campaignId);
    const { id: swappedMap } = await createPlateMap(w.people.assay, w.campaignId, {
      name: `Swapped ${w.tag}`,
      map: smallMap(true),
    });
    await uploadRun(w.people.assay, campaign, {
      plateMapId: swappedMap,
      fileName: `swapped-${w.tag}.csv`,
      contentType: "text/csv",
      bytes: smallExport(99_000 + Number.parseInt(w.tag.slice(0, 4), 16)),
    });

    const d = await gatherDigest(campaign, new Date());
    expect(d.runs.total).toBe(2);
    expect(d.runs.failedQc).toBe(1);
    expect(d.runs.accepted).toBe(1);
    expect(d.newHits.map((h) => h.compoundId)).toEqual(["INH-000001"]);

    const before = (await outbox()).length;
    const s1 = await sendCampaignDigest(w.campaignId, { trigger: "send-now" });
    expect(s1.sent).toBe(4); // viewer, chemist, assay scientist, lead; the non-member gets none
    const mails = await mailsTo(before, campaign.name);
    expect(mails.map((m) => m.to[0]).sort()).toEqual(
      [w.people.assay.email, w.people.chemist.email, w.people.lead.email, w.people.viewer.email].sort(),
    );
    const one = mails[0]!;
    expect(one.text).toContain("2 plate runs uploaded, 1 accepted, 1 failed QC");
    expect(one.text).toContain("INH-000001");
    expect(one.html).toContain(`/campaigns/${w.campaignId}/plates`);
    expect(one.idempotency_key).toMatch(new RegExp(`^digest/${w.campaignId}/`));

    const s2 = await sendCampaignDigest(w.campaignId, { trigger: "send-now" });
    expect(s2).toMatchObject({ sent: 0, alreadySent: 4 });
    expect(await mailsTo(before, campaign.name)).toHaveLength(4);
  });

  it("sends one message per recipient when two sends race", async () => {
    const w = await makeWorld();
    const campaign = await campaignRow(w.campaignId);
    const before = (await outbox()).length;
    const [a, b] = await Promise.all([
      sendCampaignDigest(w.campaignId, { trigger: "schedule" }),
      sendCampaignDigest(w.campaignId, { trigger: "send-now" }),
    ]);
    expect(a.sent + b.sent).toBe(4);
    const mails = await mailsTo(before, campaign.name);
    expect(mails).toHaveLength(4);
    expect(new Set(mails.map((m) => m.to[0])).size).toBe(4);
  });

  it("records a failed send and retries it only after its backoff", async () => {
    const w = await makeWorld();
    // A member whose address the e-mail API refuses (empty): the send fails.
    const bad = { id: crypto.randomUUID(), email: "", name: "No address (invented)" };
    await db.insert(users).values({ ...bad, passwordHash: await hashPassword(TEST_PASSWORD) });
    await db.insert(memberships).values({ campaignId: w.campaignId, userId: bad.id, role: "viewer" });
    const now = new Date();
    const s = await sendCampaignDigest(w.campaignId, { trigger: "schedule", now });
    expect(s).toMatchObject({ sent: 4, failed: 1 });
    const row = async () =>
      (
        await db
          .select()
          .from(digestSends)
          .where(and(eq(digestSends.campaignId, w.campaignId), eq(digestSends.userId, bad.id)))
      )[0]!;
    const r1 = await row();
    expect(r1.status).toBe("failed");
    expect(r1.attempts).toBe(1);
    expect(r1.lastError).toMatch(/not accepted/);
    expect(r1.nextAttemptAt!.getTime() - now.getTime()).toBe(60_000);
    await sendCampaignDigest(w.campaignId, { trigger: "retry", now: new Date(now.getTime() + 30_000) });
    expect((await row()).attempts).toBe(1); // too early
    await sendCampaignDigest(w.campaignId, { trigger: "retry", now: new Date(now.getTime() + 61_000) });
    const r3 = await row();
    expect(r3.attempts).toBe(2);
    expect(r3.nextAttemptAt!.getTime() - (now.getTime() + 61_000)).toBe(5 * 60_000);
  });
});
