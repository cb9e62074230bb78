// Previewing the weekly digest against the real database and the e-mail fake's outbox: the HTML
// is rendered for the lead and nothing is sent; a viewer may not ask for it.
import { describe, it, expect } from "vitest";
import { makeWorld, outbox, callRoute } from "@/test/harness";
import { platesWorld } from "@/test/plates";
import * as digestRoute from "@/app/api/campaigns/[campaignId]/digest/route";

describe("weekly digest", () => {
  it("previews the HTML without sending (POST /api/campaigns/{id}/digest)", async () => {
    const w = await makeWorld();
    await platesWorld(w);
    const before = (await outbox()).length;
    const r = await callRoute(digestRoute.POST, {
      user: w.people.lead,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/digest`,
      params: { campaignId: w.campaignId },
      body: { preview: true },
    });
    expect(r.status).toBe(200);
    expect((r.json as { html: string }).html).toContain(`Test campaign ${w.tag}`);
    expect((await outbox()).length).toBe(before);
    const v = await callRoute(digestRoute.POST, {
      user: w.people.viewer,
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/digest`,
      params: { campaignId: w.campaignId },
      body: {},
    });
    expect(v.status).toBe(403);
  });
});
