// Browser journey on the INVENTED demo campaign: a mechanism call whose chosen model fails its
// adequacy checks shows "inadequate" as a chip of its own on the hit grid, with why on hover; the
// mechanism page lists each proposed outlier with its well, [S], [I], rate, residual and p.
// Screenshots of both.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
let page: Page;
let campaignPath = "";
beforeAll(async () => {
  browser = await launch();
  page = await newPage(browser);
  await signIn(page, "lead@example.org");
  const href = await page.locator("a", { hasText: "Vetrase-2" }).first().getAttribute("href");
  campaignPath = href!;
});
afterAll(async () => {
  await browser?.close();
});

describe("mechanism labels", () => {
  it("the hit grid shows an inadequate call as its own chip, with why on hover", async () => {
    await page.goto(`${APP_URL}${campaignPath}/hits`);
    await page.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').waitFor({ timeout: 60_000 });
    // Only the mechanism-study compounds: the demo's four, so the inadequate one is on screen.
    for (const m of ["competitive", "uncompetitive", "noncompetitive", "mixed"])
      await page
        .getByRole("group", { name: "Filter by mechanism" })
        .getByRole("button", { name: m, exact: true })
        .click();
    const chip = page.locator(".ag-row .chip", { hasText: /^inadequate$/ }).first();
    await chip.waitFor({ timeout: 30_000 });
    expect(await chip.getAttribute("title")).toMatch(
      /^Mechanism inadequate: .+ Open the mechanism result before using this Ki\.$/,
    );
    await chip.hover();
    await shot(page, "hits-grid-mechanism-inadequate");
  });

  it("the mechanism page lists a proposed outlier with well, [S], [I], rate, residual and p", async () => {
    await page.goto(`${APP_URL}${campaignPath}/analyses`);
    await page
      .getByRole("link", { name: /Mechanism study/ })
      .first()
      .click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: "INH-000003" }).first().click();
    await page.waitForURL(/INH-000003$/);
    const list = page.getByTestId("outlier-proposals");
    await list.waitFor({ timeout: 30_000 });
    const text = await list.innerText();
    expect(text).toMatch(/ · \[S\] [^·]+ · \[I\] [^·]+ · [\d.e+-]+ signal\/s/);
    expect(text).toMatch(/standardised residual -?\d+\.\d \(dimensionless\), p /);
    await list.scrollIntoViewIfNeeded();
    await shot(page, "analysis-mechanism-proposals");
  });
});
