// Stopping the weekly digest against the real database and the e-mail fake's outbox: a signed
// link that cannot be altered to name another person, and no mail to a member who stopped it.
import { describe, it, expect } from "vitest";
import { makeWorld, outbox } from "@/test/harness";
import { campaignRow } from "@/test/plates";
import { optOut, optOutToken, readOptOutToken, sendCampaignDigest } from ".";

const mailsTo = async (since: number, campaignName: string) =>
  (await outbox()).slice(since).filter((m) => m.subject.includes(campaignName));

describe("weekly digest", () => {
  it("sends nothing to a member who stopped it, and the signed link names one person only", async () => {
    const w = await makeWorld();
    const campaign = await campaignRow(w.campaignId);
    const token = optOutToken(w.people.viewer.id, w.campaignId);
    expect(readOptOutToken(token)).toEqual({ userId: w.people.viewer.id, campaignId: w.campaignId });
    // Swapping in another person's id breaks the signature.
    const [, sig] = token.split(".");
    const forged = `${Buffer.from(JSON.stringify({ u: w.people.lead.id, c: w.campaignId, p: "digest-opt-out" })).toString("base64url")}.${sig}`;
    expect(readOptOutToken(forged)).toBeNull();
    await optOut(w.people.viewer.id, w.campaignId, "link");
    const before = (await outbox()).length;
    const s = await sendCampaignDigest(w.campaignId, { trigger: "send-now" });
    expect(s).toMatchObject({ sent: 3, optedOut: 1 });
    expect((await mailsTo(before, campaign.name)).map((m) => m.to[0])).not.toContain(w.people.viewer.email);
  });
});
