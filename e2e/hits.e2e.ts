// Browser journey for hit triage on the INVENTED demo campaign: the demo lead filters and sorts
// the ranked grid, opens a compound's panel, records a decision, sets a status for a selection
// and exports the view; the export has the grid's rows in the grid's order. Screenshots of each.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
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

const firstId = (p: Page, row = 0) =>
  p.locator(`.ag-row[row-index="${row}"] [data-testid="open-panel"]`).first().innerText();
const count = async (p: Page) => Number((await p.getByTestId("hit-count").innerText()).replace(/[^0-9]/g, ""));

describe("hit triage", () => {
  it("shows the overview with this week's figures and the Z′ trend", async () => {
    await page.goto(`${APP_URL}${campaignPath}`);
    await page.getByTestId("overview-stats").waitFor();
    await page.locator(".js-plotly-plot").first().waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("recent-decisions").locator("li").count()).toBeGreaterThan(0);
    await shot(page, "campaign-overview");
  });

  it("filters, sorts, opens the panel, records a decision, sets a selection's status and exports the same rows", async () => {
    await page.goto(`${APP_URL}${campaignPath}/hits`);
    await page.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').waitFor({ timeout: 60_000 });
    const all = await count(page);
    expect(all).toBeGreaterThan(50);
    // The structure drawings of the rows on screen have arrived (real images, not broken links);
    // the first ones on a fresh server wait for openchemlib to load.
    await page.waitForFunction(
      () => {
        const imgs = [...document.querySelectorAll<HTMLImageElement>('.ag-row img[alt^="Structure of"]')].slice(0, 6);
        return imgs.length === 6 && imgs.every((img) => img.complete && img.naturalWidth > 0);
      },
      undefined,
      { timeout: 30_000 },
    );
    await shot(page, "hits-grid");

    // Filter: unreviewed, clean fits only.
    await page
      .getByRole("group", { name: "Filter by triage status" })
      .getByRole("button", { name: "unreviewed" })
      .click();
    await page.getByLabel("Fit quality").selectOption("false");
    await expect.poll(() => count(page), { timeout: 30_000 }).toBeLessThan(all);
    // Sort by IC50, ascending (a click on the header).
    await page.locator('.ag-header-cell[col-id="ic50"] .ag-header-cell-label').click();
    await expect
      .poll(async () => (await page.getByText("Sorted by IC50, ascending").count()) > 0, { timeout: 30_000 })
      .toBe(true);
    await page.waitForTimeout(500);
    const api = (await (
      await page.request.get(
        `${APP_URL}/api${campaignPath}/hits?sort=ic50&dir=asc&status=unreviewed&flagged=false&limit=5`,
      )
    ).json()) as { items: { registryId: string }[]; total: number };
    await expect.poll(() => firstId(page), { timeout: 30_000 }).toBe(api.items[0]!.registryId);
    expect(await firstId(page, 1)).toBe(api.items[1]!.registryId);
    expect(await count(page)).toBe(api.total);
    await shot(page, "hits-grid-filtered");

    // Export the view: the CSV has the same rows in the same order, with units in the headers.
    const [csvDownload] = await Promise.all([page.waitForEvent("download"), page.getByTestId("export-csv").click()]);
    const csv = fs
      .readFileSync((await csvDownload.path())!, "utf8")
      .trim()
      .split("\r\n");
    expect(csv[0]).toContain("Ki (µM)");
    expect(csv[0]).toContain("IC50 (µM)");
    expect(csv.length - 1).toBe(api.total);
    expect(csv.slice(1, 6).map((l) => l.split(",")[0])).toEqual(api.items.map((i) => i.registryId));
    const [xlsxDownload] = await Promise.all([page.waitForEvent("download"), page.getByTestId("export-xlsx").click()]);
    expect(xlsxDownload.suggestedFilename()).toMatch(/\.xlsx$/);
    expect(fs.statSync((await xlsxDownload.path())!).size).toBeGreaterThan(1000);

    // Open the first compound's panel and record a decision with a reason.
    const target = api.items[0]!.registryId;
    await page.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').click();
    const panel = page.getByTestId("hit-panel");
    await panel.getByText("Triage decision").waitFor();
    await panel
      .locator(".js-plotly-plot")
      .first()
      .waitFor({ timeout: 30_000 })
      .catch(() => undefined);
    await shot(page, "hits-panel");
    await panel.getByLabel("New status").selectOption("confirmed");
    await panel.locator('input[name="comment"]').fill("Clean curve; confirm in the mechanism study (e2e, invented)");
    await panel.getByRole("button", { name: "Record" }).click();
    await panel.getByText("Recorded: confirmed.").waitFor({ timeout: 30_000 });
    await panel
      .getByTestId("status-history")
      .getByText("Clean curve; confirm in the mechanism study")
      .waitFor({ timeout: 30_000 });
    await shot(page, "hits-panel-decided");
    await panel.getByRole("button", { name: "Close the compound panel" }).click();

    // The decided compound left the "unreviewed" view.
    await expect.poll(() => firstId(page), { timeout: 30_000 }).not.toBe(target);

    // Select two rows and put them on hold together.
    const a = await firstId(page, 0);
    const b = await firstId(page, 1);
    await page.locator('.ag-row[row-index="0"] input[type="checkbox"]').first().check();
    await page.locator('.ag-row[row-index="1"] input[type="checkbox"]').first().check();
    const bar = page.getByRole("region", { name: "Set the status of the selection" });
    await bar.getByLabel("New status for the selection").selectOption("on-hold");
    await shot(page, "hits-selection");
    await bar.getByRole("button", { name: "Set status for 2" }).click();
    await page.getByText('Status "on hold" recorded for 2 compounds').waitFor({ timeout: 30_000 });
    const held = (await (
      await page.request.get(`${APP_URL}/api${campaignPath}/hits?status=on-hold&limit=100`)
    ).json()) as { items: { registryId: string }[] };
    expect(held.items.map((i) => i.registryId)).toEqual(expect.arrayContaining([a, b]));
  });

  it("lets a viewer read the grid but offers no triage controls", async () => {
    const viewerPage = await newPage(browser);
    await signIn(viewerPage, "viewer@example.org");
    await viewerPage.goto(`${APP_URL}${campaignPath}/hits`);
    await viewerPage.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').waitFor({ timeout: 60_000 });
    await viewerPage.locator('.ag-row[row-index="0"] [data-testid="open-panel"]').click();
    await viewerPage.getByTestId("hit-panel").getByText("Status history").waitFor();
    expect(await viewerPage.getByText("Triage decision").count()).toBe(0);
    await shot(viewerPage, "hits-viewer-panel");
  });
});
