// Saved views of the hit grid against the real database: per person, replaced by name.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { callRoute, type World } from "@/test/harness";
import { hitsApi, hitsWorld } from "@/test/hits";
import * as viewsRoute from "@/app/api/campaigns/[campaignId]/hits/views/route";
import { stopBoss } from "@/server/jobs/boss";

let w: World;
const { base } = hitsApi(() => w);

beforeAll(async () => {
  ({ w } = await hitsWorld());
});
afterAll(() => stopBoss());

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
