// The digest stop page's lookup against the real database: a valid link names its person and
// campaign, an altered one nothing (invented test people and campaigns).
import { describe, it, expect } from "vitest";
import crypto from "node:crypto";
import { makeWorld } from "@/test/harness";
import { optOutToken, stopLinkTarget } from ".";

describe("digest stop link", () => {
  it("names the person and campaign of a valid link, and nothing for an altered one", async () => {
    const w = await makeWorld();
    const token = optOutToken(w.people.viewer.id, w.campaignId);
    expect(await stopLinkTarget(token)).toEqual({
      email: w.people.viewer.email,
      campaignName: `Test campaign ${w.tag}`,
    });
    expect(await stopLinkTarget(`${token}x`)).toBeNull();
    expect(await stopLinkTarget("not-a-token")).toBeNull();
  });

  it("leaves out a person or campaign that no longer exists", async () => {
    const token = optOutToken(`gone-${crypto.randomUUID()}`, crypto.randomUUID());
    expect(await stopLinkTarget(token)).toEqual({ email: null, campaignName: null });
  });
});
