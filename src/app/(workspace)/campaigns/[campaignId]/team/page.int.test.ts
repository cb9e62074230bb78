// The team page as each role sees it, rendered from the real database (invented test people):
// viewers and other members see names and roles only; leads and admins see e-mails; only admins
// get the controls that carry member ids.
import { describe, it, expect } from "vitest";
import { renderToStaticMarkup } from "react-dom/server";
import { as, makeWorld } from "@/test/harness";
import TeamPage from "./page";

const render = async (w: Awaited<ReturnType<typeof makeWorld>>, who: keyof typeof w.people) =>
  as(w.people[who], async () =>
    renderToStaticMarkup(await TeamPage({ params: Promise.resolve({ campaignId: w.campaignId }) })),
  );

describe("team page", () => {
  it("shows a viewer names and roles, and no e-mail or user id", async () => {
    const w = await makeWorld();
    const html = await render(w, "viewer");
    for (const p of Object.values(w.people)) {
      expect(html).not.toContain(p.email);
      expect(html).not.toContain(p.id);
    }
    expect(html).toContain(w.people.lead.name);
    expect(html).not.toContain("Pending invitations");
  });

  it("shows a lead the e-mails, and an admin the controls", async () => {
    const w = await makeWorld();
    const lead = await render(w, "lead");
    expect(lead).toContain(w.people.viewer.email);
    const admin = await render(w, "admin");
    expect(admin).toContain(w.people.viewer.email);
    expect(admin).toContain("Pending invitations");
  });
});
