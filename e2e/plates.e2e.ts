// Browser journey for plates: the demo assay scientist imports a plate map from a fixture CSV,
// uploads an INVENTED fixture export through the upload screen (preview first, then stored), and
// the run page with its heatmaps and QC panel is screenshotted. Also looks at the seeded demo runs.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import path from "node:path";
import type { Browser, Page } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
let page: Page;
let platesUrl = "";
beforeAll(async () => {
  browser = await launch();
  page = await newPage(browser);
  await signIn(page, "assay@example.org");
  const href = await page.locator("tbody tr a", { hasText: "Vetrase-2" }).first().getAttribute("href");
  platesUrl = `${APP_URL}${href}/plates`;
});
afterAll(async () => {
  await browser?.close();
});

const fixture = (f: string) => path.resolve("fixtures/plates", f);

describe("plates", () => {
  it("lists the seeded demo runs with their Z′ trend", async () => {
    await page.goto(platesUrl);
    await expect(page.locator("h1").innerText()).resolves.toBe("Plates");
    await page.locator(".js-plotly-plot").first().waitFor({ timeout: 30_000 });
    expect(await page.getByRole("link", { name: "screen-07.csv" }).count()).toBe(1);
    await shot(page, "plates-overview");
  });

  it("imports a plate map from CSV in the editor and saves it", async () => {
    await page.goto(`${platesUrl}/maps/new`);
    await page.getByText("Chemical safety.").waitFor();
    await page.selectOption("select:near(:text('Format'))", "96");
    await page.setInputFiles('input[aria-label="Import plate map CSV"]', fixture("single-dose-96.map.csv"));
    await page.getByText("Imported single-dose-96.map.csv.").waitFor();
    await page.getByText("The plate map is complete").waitFor();
    await page.fill('input[name="name"]', "E2E single-dose 96 (invented)");
    await Promise.all([
      page.waitForURL(/\/plates\/maps\/[0-9a-f-]{36}$/, { timeout: 30_000 }),
      page.getByRole("button", { name: "Save as a new plate map" }).click(),
    ]);
    await expect(page.locator("h1").innerText()).resolves.toBe("E2E single-dose 96 (invented)");
    await shot(page, "plate-map-editor");
  });

  it("uploads a fixture export: preview, then stored; the run page shows heatmaps and QC", async () => {
    await page.getByRole("link", { name: "Upload exports for this map" }).click();
    await page.waitForURL(/\/plates\/upload/);
    await page.setInputFiles("#export-files", fixture("single-dose-96.long.csv"));
    const report = page.getByTestId("parse-report");
    await report.getByText("CSV, long table, endpoint: 96-well plate, 96 wells").waitFor({ timeout: 30_000 });
    await report.getByText("would pass").waitFor();
    await shot(page, "plate-upload-preview");
    await Promise.all([
      page.waitForURL(/\/plates\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 }),
      page.getByRole("button", { name: "Store and parse" }).click(),
    ]);
    await page.getByTestId("heatmap-raw").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await page.getByTestId("heatmap-inhibition").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await expect(page.getByRole("region", { name: "Quality control" }).getByText("Z′-factor").count()).resolves.toBe(1);
    await expect(page.getByText(/^[0-9a-f]{64}$/).count()).resolves.toBe(1);
    await shot(page, "plate-run");
  });

  it("masks a well with a reason; QC is recomputed and the mask is in the history", async () => {
    await page.fill("#go-well", "A3");
    await page.getByRole("button", { name: "Inspect" }).click();
    await page.fill("#mask-reason", "bubble seen at dispensing (e2e)");
    await page.getByRole("button", { name: "Mask A3" }).click();
    await page.getByText(/Well A3 masked\. QC recomputed/).waitFor({ timeout: 30_000 });
    // Once in the well inspector ("masked because"), once in the mask history.
    await expect
      .poll(() => page.getByRole("cell", { name: "bubble seen at dispensing (e2e)" }).count(), { timeout: 30_000 })
      .toBe(2);
    await shot(page, "plate-run-masked");
  });

  it("refuses the same file again and links to the earlier run", async () => {
    await page.goto(`${platesUrl}/upload`);
    await page.selectOption("#plate-map", { label: "E2E single-dose 96 (invented) (96-well)" });
    await page.setInputFiles("#export-files", fixture("single-dose-96.long.csv"));
    await page.getByTestId("parse-report").getByText("would pass").waitFor({ timeout: 30_000 });
    await page.getByRole("button", { name: "Store and parse" }).click();
    await page.getByRole("link", { name: "Open the earlier run" }).waitFor({ timeout: 30_000 });
    await shot(page, "plate-upload-duplicate");
  });

  it("shows a seeded run with an edge effect, and the kinetic mechanism run", async () => {
    await page.goto(platesUrl);
    await page.getByRole("link", { name: "screen-13.csv" }).click();
    await page.getByTestId("heatmap-raw").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await page
      .getByText(/edge effect/)
      .first()
      .waitFor();
    await shot(page, "plate-run-edge");
    await page.goto(platesUrl);
    await page.getByRole("link", { name: "mechanism-01.csv" }).click();
    await page.getByTestId("heatmap-raw").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await shot(page, "plate-run-kinetic");
  });

  it("the editor lays out a 1536-well plate", async () => {
    await page.goto(`${platesUrl}/maps/new`);
    await page.selectOption("select:near(:text('Format'))", "1536");
    await expect(page.getByTestId("plate-map-grid").locator("[data-i]").count()).resolves.toBe(1536);
    await shot(page, "plate-map-editor-1536");
  });
});
