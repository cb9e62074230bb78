// Browser journey for a day's plates in one upload: the demo assay scientist zips four exports
// (a re-read of an INVENTED demo plate matched to its map by file name, an exact repeat of another,
// one whose name matches no plate map, and a file that is no export), uploads the zip on the plates page, waits through
// the progress bar, and reviews the batch: outcomes, QC figures, signal maps; then accepts all
// that pass with one reason. Screenshots plate-batch-review and plate-batch-accepted.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import JSZip from "jszip";
import type { Browser, Page } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL, ARTIFACTS } from "./lib/browser";

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

async function rawFile(fileName: string): Promise<Buffer> {
  const href = await page.getByRole("link", { name: fileName, exact: true }).first().getAttribute("href");
  const runId = href!.split("/").pop()!;
  const campaignId = href!.split("/")[2]!;
  const res = await page.request.get(`${APP_URL}/api/campaigns/${campaignId}/plate-runs/${runId}/file`);
  expect(res.status()).toBe(200);
  return res.body();
}

describe("plate batches", () => {
  it("uploads a zip of four exports and reviews the batch; accepts all that pass", async () => {
    await page.goto(platesUrl);
    const rerun = Buffer.concat([Buffer.from("Invented e2e re-read\n"), await rawFile("screen-01.csv")]);
    const repeat = await rawFile("screen-02.csv");
    const mystery = Buffer.concat([Buffer.from("Invented e2e copy\n"), await rawFile("screen-03.csv")]);
    const zip = new JSZip();
    zip.file("day/screen-01_reread.csv", rerun);
    zip.file("day/screen-02.csv", repeat);
    zip.file("day/mystery-plate.csv", mystery);
    zip.file("day/screen-04_notes.csv", "this is not a reader export\n");
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    const zipPath = path.join(ARTIFACTS, "e2e-day.zip");
    fs.writeFileSync(zipPath, await zip.generateAsync({ type: "uint8array", compression: "DEFLATE" }));

    await page.setInputFiles('input[aria-label="Reader exports or a zip of them"]', zipPath);
    await Promise.all([
      page.waitForURL(/\/plates\/batches\/[0-9a-f-]{36}$/, { timeout: 60_000 }),
      page.getByRole("button", { name: "Upload 1 file" }).click(),
    ]);
    await expect(page.locator("h1").innerText()).resolves.toBe("Plate batch: e2e-day.zip");
    await page.getByText("already uploaded", { exact: true }).waitFor();
    await page.getByText("no plate map", { exact: true }).waitFor();
    await page.getByText("refused", { exact: true }).waitFor();
    await page.getByText("stored", { exact: true }).first().waitFor();
    expect(await page.locator('svg[role="img"]').count()).toBeGreaterThanOrEqual(1);
    await page.getByText("Research use only.").first().waitFor();
    await shot(page, "plate-batch-review");

    await page.fill('input[placeholder^="e.g. controls and Z′"]', "Controls and Z′ within limits (e2e)");
    await page.getByRole("button", { name: "Accept all that pass" }).click();
    await page.getByText(/run(s)? accepted;/).waitFor({ timeout: 30_000 });
    await shot(page, "plate-batch-accepted");
  });
});
