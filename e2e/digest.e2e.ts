// Browser journey for the weekly digest on the invented demo campaign: the lead presses
// "Send now"; the local e-mail fake's outbox shows one digest per member; screenshots of the
// digest page, the outbox page and the rendered e-mail.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser } from "playwright-core";
import { launch, newPage, shot, signIn } from "./lib/browser";

const MAIL = process.env.RESEND_BASE_URL ?? "http://127.0.0.1:4025";
let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

type Msg = { id: string; to: string[]; subject: string; html: string | null };

describe("weekly digest", () => {
  it("the lead sends it now and each member gets exactly one", async () => {
    const page = await newPage(browser);
    await signIn(page, "lead@example.org");
    await page.getByRole("link", { name: /Vetrase-2/ }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    const campaignPath = new URL(page.url()).pathname;
    await page.getByRole("link", { name: "Weekly digest" }).click();
    await page.waitForURL(/\/digest$/);
    await page.locator("iframe[title='Digest preview']").waitFor();
    await shot(page, "digest-page");
    // The worker's schedule may already have sent this week's digest (the demo's Monday 07:00
    // has passed): either way, after "Send now" each member has exactly one for this week.
    await page.getByRole("button", { name: "Send now" }).click();
    const result = page.getByText(/Week of (\d{4}-\d{2}-\d{2}): \d+ sent/);
    await result.waitFor({ timeout: 60_000 });
    const week = (await result.innerText()).match(/Week of (\d{4}-\d{2}-\d{2})/)![1]!;
    const thisWeek = async () =>
      ((await (await fetch(`${MAIL}/__outbox`)).json()) as { data: Msg[] }).data.filter(
        (m) => m.subject.includes(`week of ${week}`) && (m.html ?? "").includes(`${campaignPath}/`),
      );
    // (A send the worker had in flight at that moment lands within seconds.)
    await expect.poll(async () => (await thisWeek()).length, { timeout: 20_000 }).toBe(4);
    const all = await thisWeek();
    expect(all.map((m) => m.to[0]).sort()).toEqual([
      "assay@example.org",
      "chemist@example.org",
      "lead@example.org",
      "viewer@example.org",
    ]);

    // A second press sends nothing new.
    await page.getByRole("button", { name: "Send now" }).click();
    await page.getByText(/0 sent, 4 had this week's digest already/).waitFor({ timeout: 60_000 });
    expect(await thisWeek()).toHaveLength(4);

    const outbox = await newPage(browser);
    await outbox.goto(`${MAIL}/`);
    await shot(outbox, "outbox");
    await outbox.goto(`${MAIL}/__outbox/${all[0]!.id}/html`);
    await expect(outbox.getByText("Top ten by Ki").count()).resolves.toBe(1);
    await shot(outbox, "digest-email");
  });
});
