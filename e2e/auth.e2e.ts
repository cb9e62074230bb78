// Browser journeys for sign-in and roles: each invented demo account signs in through the real
// form in chromium and sees only what its role may see.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("sign-in and roles", () => {
  it("shows the sign-in page", async () => {
    const page = await newPage(browser);
    await page.goto(`${APP_URL}/sign-in`);
    await expect(page.locator("h1").innerText()).resolves.toBe("Sign in");
    await shot(page, "sign-in");
    await page.close();
  });

  it("refuses a wrong password with a clear message", async () => {
    const page = await newPage(browser);
    await page.goto(`${APP_URL}/sign-in`);
    await page.fill('input[name="email"]', "lead@example.org");
    await page.fill('input[name="password"]', "not-the-password");
    await page.click('button[type="submit"]');
    await page.getByText("That e-mail and password do not match an account.").waitFor({ timeout: 15_000 });
    await page.close();
  });

  const cases = [
    { email: "admin@example.org", campaigns: 2, admin: true },
    { email: "lead@example.org", campaigns: 2, admin: false },
    { email: "chemist@example.org", campaigns: 2, admin: false },
    { email: "assay@example.org", campaigns: 2, admin: false },
    { email: "viewer@example.org", campaigns: 1, admin: false },
  ];
  for (const c of cases) {
    it(`${c.email} signs in and sees ${c.campaigns} campaign(s)`, async () => {
      const page = await newPage(browser);
      await signIn(page, c.email);
      expect(new URL(page.url()).pathname).toBe("/campaigns");
      const rows = page.locator("tbody tr");
      await expect(rows.count()).resolves.toBe(c.campaigns);
      await expect(page.getByRole("link", { name: "Audit log" }).count()).resolves.toBe(c.admin ? 1 : 0);
      await expect(page.getByText("New campaign").count()).resolves.toBe(c.admin ? 1 : 0);
      if (c.email === "lead@example.org") await shot(page, "campaign-list");
      await page.close();
    });
  }

  it("hides the other campaign from the viewer (404), and shows the team page read-only", async () => {
    const admin = await newPage(browser);
    await signIn(admin, "admin@example.org");
    const hrefs = await admin
      .locator("tbody tr a")
      .evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).getAttribute("href")));
    await admin.goto(`${APP_URL}${hrefs.find((h) => h)!}/team`);
    await shot(admin, "team-page-admin");
    await admin.goto(`${APP_URL}/admin/audit`);
    await expect(admin.locator("h1").innerText()).resolves.toBe("Audit log");
    await shot(admin, "audit-log");
    await admin.close();

    const viewer = await newPage(browser);
    await signIn(viewer, "viewer@example.org");
    const own = await viewer.locator("tbody tr a").getAttribute("href");
    const other = hrefs.find((h) => h !== own)!;
    const res = await viewer.goto(`${APP_URL}${other}`);
    expect(res?.status()).toBe(404);
    const resAdmin = await viewer.goto(`${APP_URL}/admin/audit`);
    expect(resAdmin?.status()).toBe(404);
    await viewer.goto(`${APP_URL}${own}/team`);
    await expect(
      viewer.getByText("Only the project lead or an administrator changes thresholds.").count(),
    ).resolves.toBe(1);
    await expect(viewer.getByRole("button", { name: "Send invitation" }).count()).resolves.toBe(0);
    await shot(viewer, "team-page-viewer");
    await viewer.close();
  });
});
