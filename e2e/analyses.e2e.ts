// Browser journey for the analysis pipeline on the invented demo campaign: an assay scientist
// creates a dose-response experiment from accepted runs, runs it through the UI (the worker does
// the work), and opens a dose-response page and a mechanism page.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
let page: Page;
beforeAll(async () => {
  browser = await launch();
  page = await newPage(browser);
  await signIn(page, "assay@example.org");
});
afterAll(async () => {
  await browser?.close();
});

async function openDemoCampaign(p: Page) {
  await p.goto(`${APP_URL}/campaigns`);
  await p.getByRole("link", { name: /Vetrase-2/ }).click();
  await p.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
  return new URL(p.url()).pathname;
}

describe("analyses", () => {
  it("runs a dose-response analysis through the UI and shows the curve", async () => {
    const base = await openDemoCampaign(page);
    await page.goto(`${APP_URL}${base}/analyses`);
    await page.fill('input[name="name"]', "E2E dose-response");
    await page.selectOption('select[name="kind"]', "dose-response");
    await page.fill('input[name="substrateUm"]', "20");
    const rows = page.locator("tr", { hasText: "dose-response-" });
    const n = await rows.count();
    expect(n).toBeGreaterThan(0);
    for (let k = 0; k < n; k++) await rows.nth(k).locator('input[type="checkbox"]').check();
    await Promise.all([
      page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/, { timeout: 30_000 }),
      page.getByRole("button", { name: "Create experiment" }).click(),
    ]);
    await page.getByRole("button", { name: "Run analysis" }).click();
    await page.getByText("The results below are up to date").waitFor({ timeout: 90_000 });
    await page.locator("table a", { hasText: "INH-000001" }).first().waitFor();
    await shot(page, "analysis-dose-response-experiment");
    await page.locator("table a", { hasText: "INH-000001" }).first().click();
    await page.waitForURL(/INH-000001$/);
    await page.locator(".js-plotly-plot").first().waitFor({ timeout: 30_000 });
    await expect(page.getByText("95 % CI (t on log10 IC50)").count()).resolves.toBe(1);
    await shot(page, "analysis-dose-response");
  });

  it("shows a mechanism page with the model comparison and the double-reciprocal diagnostic", async () => {
    const base = await openDemoCampaign(page);
    await page.goto(`${APP_URL}${base}/analyses`);
    await page
      .getByRole("link", { name: /Mechanism study/ })
      .first()
      .click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: "INH-000004" }).first().click();
    await page.waitForURL(/INH-000004$/);
    await page.getByText("Model comparison").waitFor();
    await page.locator(".js-plotly-plot").nth(1).waitFor({ timeout: 30_000 });
    await expect(
      page.getByText("Double-reciprocal (diagnostic only; not used for fitting)").count(),
    ).resolves.toBeGreaterThan(0);
    await shot(page, "analysis-mechanism");
  });
});
