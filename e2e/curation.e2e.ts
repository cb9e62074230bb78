// Browser journey for curation on the INVENTED demo campaign: the demo assay scientist opens a
// dose-response result, clicks a well off the curve (the browser refits at once: curve and IC50
// marked "preview, not saved"), saves the exclusion with a reason, finds it in the run's mask
// history, and runs the analysis again: the new analysis's input hash differs, it counts one more
// masked well, and the stored IC50 is the one the preview showed.
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

const REASON = "dispensing error seen at read-out (e2e)";

/** The figures table's cell for `label`: column 1 stored, column 2 the preview. */
const figure = (p: Page, label: string, column: 1 | 2) =>
  p
    .getByTestId("dose-response-figures")
    .locator("tbody tr")
    .filter({ has: p.locator("td:first-child").getByText(label, { exact: true }) })
    .locator("td")
    .nth(column);

/**
 * The well of the fit that lies farthest from the stored curve, and where it is on the screen:
 * read from the chart's own data (the trace of wells carries each well's key as customdata).
 */
async function farthestWell(p: Page): Promise<{ key: string; x: number; y: number }> {
  const plot = p.getByTestId("dose-response-plot").locator(".js-plotly-plot");
  const found = await plot.evaluate((el) => {
    type Trace = { name?: string; x: number[]; y: number[]; customdata?: string[] };
    const gd = el as unknown as { data: Trace[]; _fullLayout: Record<string, unknown> };
    const wells = gd.data.findIndex((t) => t.name === "wells in the fit");
    const curve = gd.data.find((t) => (t.name ?? "").startsWith("4PL fit"))!;
    const at = (x: number) => {
      const lx = Math.log10(x);
      for (let k = 1; k < curve.x.length; k++) {
        const a = Math.log10(curve.x[k - 1]!);
        const b = Math.log10(curve.x[k]!);
        if (lx <= b) return curve.y[k - 1]! + ((lx - a) / (b - a)) * (curve.y[k]! - curve.y[k - 1]!);
      }
      return curve.y[curve.y.length - 1]!;
    };
    const t = gd.data[wells]!;
    let best = 0;
    t.x.forEach((x, j) => {
      if (Math.abs(t.y[j]! - at(x)) > Math.abs(t.y[best]! - at(t.x[best]!))) best = j;
    });
    return { trace: wells, index: best, key: t.customdata![best]! };
  });
  const point = plot.locator(".scatterlayer .trace").nth(found.trace).locator("path.point").nth(found.index);
  await point.scrollIntoViewIfNeeded();
  const box = (await point.boundingBox())!;
  return { key: found.key, x: box.x + box.width / 2, y: box.y + box.height / 2 };
}

describe("curation", () => {
  it("excludes a well by clicking it, saves the mask, and the next analysis uses it", async () => {
    await page.goto(`${APP_URL}/campaigns`);
    await page.getByRole("link", { name: /Vetrase-2/ }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    const campaignPath = new URL(page.url()).pathname;
    await page.goto(`${APP_URL}${campaignPath}/analyses`);
    await page.getByRole("link", { name: "Dose-response confirmation (invented demo)" }).click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: "INH-000001" }).first().click();
    await page.waitForURL(/INH-000001$/);
    await page.getByTestId("dose-response-plot").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    // Masks saved by an earlier journey on the same data and not analysed yet: analyse them first.
    if (await page.getByRole("button", { name: "Run analysis" }).count()) {
      await page.getByRole("button", { name: "Run analysis" }).click();
      await expect.poll(() => page.getByRole("button", { name: "Run analysis" }).count(), { timeout: 120_000 }).toBe(0);
    }

    const storedIc50 = await figure(page, "IC50", 1).innerText();
    const storedWells = Number(await figure(page, "Wells in the fit", 1).innerText());
    const hashBefore = await page.getByTestId("input-hash").getAttribute("title");
    const maskedBefore = Number(await page.getByTestId("masked-count").innerText());
    expect(storedIc50).toMatch(/\d.*[pnµm]M$/);

    // Click the well: the fit is redone in the browser at once, nothing is stored yet.
    const target = await farthestWell(page);
    await page.mouse.click(target.x, target.y);
    await page.getByText("Preview, not saved.").waitFor({ timeout: 10_000 });
    await expect(figure(page, "Wells in the fit", 2).innerText()).resolves.toBe(String(storedWells - 1));
    const previewIc50 = await figure(page, "IC50", 2).innerText();
    expect(previewIc50).toMatch(/\d.*[pnµm]M$/);
    expect(previewIc50).not.toBe(storedIc50);
    await expect(figure(page, "95 % CI (t on log10 IC50)", 2).innerText()).resolves.toMatch(/M – /);
    const plotNames = await page
      .getByTestId("dose-response-plot")
      .locator(".js-plotly-plot")
      .evaluate((el) => (el as unknown as { data: { name?: string }[] }).data.map((t) => t.name));
    expect(plotNames).toContain("4PL fit (preview, not saved)");
    expect(plotNames).toContain("stored fit");
    expect(plotNames).toContain("excluded (left out of the fit)");

    // The reason is asked for inline; saving without one is not possible.
    await expect(page.getByRole("button", { name: "Save 1 change as well masks" }).isDisabled()).resolves.toBe(true);
    await page.fill("#curation-reason", REASON);
    await shot(page, "curation-preview");
    await page.getByRole("button", { name: "Save 1 change as well masks" }).click();
    await page.getByText("1 change saved as audited well masks.").waitFor({ timeout: 30_000 });
    await page.getByText("Saved masks, not yet analysed.").waitFor({ timeout: 30_000 });
    await expect(page.getByTestId("input-hash").getAttribute("title")).resolves.toBe(hashBefore);

    // The run's page lists the mask with its reason in its history.
    const [runId, well] = target.key.split("|") as [string, string];
    await page.goto(`${APP_URL}${campaignPath}/plates/runs/${runId}`);
    const history = page.locator("section", { hasText: "Masked wells: history" });
    await history
      .locator("tbody tr")
      .filter({ hasText: REASON })
      .filter({ has: page.getByRole("cell", { name: well, exact: true }) })
      .filter({ hasText: "still masked" })
      .first()
      .waitFor({ timeout: 30_000 });
    await page.getByTestId("heatmap-raw").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await shot(page, "curation-run-mask-history");

    // Run the analysis again from the result page: it uses the mask.
    await page.goBack();
    await page.getByTestId("dose-response-plot").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await page.getByRole("button", { name: "Run analysis" }).click();
    await expect
      .poll(() => page.getByTestId("input-hash").getAttribute("title"), { timeout: 120_000 })
      .not.toBe(hashBefore);
    await expect(page.getByTestId("masked-count").innerText()).resolves.toBe(String(maskedBefore + 1));
    await expect(page.getByText("Saved masks, not yet analysed.").count()).resolves.toBe(0);
    await expect(figure(page, "Wells in the fit", 1).innerText()).resolves.toBe(String(storedWells - 1));
    await expect(figure(page, "IC50", 1).innerText()).resolves.toBe(previewIc50);
    await page.getByTestId("dose-response-plot").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await shot(page, "curation-reanalysed");
  });

  it("on a mechanism page a click on the rate-vs-[S] plot refits all models in the browser, and Discard undoes it", async () => {
    await page.goto(`${APP_URL}/campaigns`);
    await page.getByRole("link", { name: /Vetrase-2/ }).click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    await page.goto(`${page.url()}/analyses`);
    await page.getByRole("link", { name: "Mechanism study, four hits (invented demo)" }).click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: "INH-000001" }).first().click();
    await page.waitForURL(/INH-000001$/);
    const plot = page.getByTestId("rate-plot").locator(".js-plotly-plot");
    await plot.waitFor({ timeout: 30_000 });
    const found = await plot.evaluate((el) => {
      const gd = el as unknown as { data: { name?: string; customdata?: string[] }[] };
      return gd.data.findIndex((t) => (t.name ?? "").startsWith("[I] =") && (t.customdata?.length ?? 0) > 0);
    });
    expect(found).toBeGreaterThanOrEqual(0);
    const point = plot.locator(".scatterlayer .trace").nth(found).locator("path.point").last();
    await point.scrollIntoViewIfNeeded();
    const box = (await point.boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page.getByText("Preview, not saved.").waitFor({ timeout: 10_000 });
    await expect(
      page.getByText(/Model comparison \(global fits, \d+ wells; preview, not saved\)/).count(),
    ).resolves.toBe(1);
    await page.fill("#curation-reason", "reading looks wrong (e2e, not saved)");
    await shot(page, "curation-mechanism-preview");
    await page.getByRole("button", { name: "Discard" }).click();
    await expect(page.getByText("Preview, not saved.").count()).resolves.toBe(0);
  });
});
