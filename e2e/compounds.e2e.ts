// Browser journeys of the compound registry on the INVENTED demo data (300 demo compounds,
// INH-000001…INH-000300): the list with search and substructure search, a compound page, the
// register form with its live preview and the duplicate case, and a bulk import with three bad
// records registered in "valid records only" mode.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Browser } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("compound registry", () => {
  it("lists the registry with structure thumbnails, searches by name and by substructure", async () => {
    const page = await newPage(browser);
    await signIn(page, "chemist@example.org");
    await page.goto(`${APP_URL}/compounds`);
    await page.locator(".ag-row a", { hasText: "INH-000001" }).first().waitFor({ timeout: 30_000 });
    await expect(page.getByTestId("result-count").innerText()).resolves.toMatch(/^1–50 of 300$/);
    await expect(page.locator(".ag-row svg").count()).resolves.toBeGreaterThan(5);
    await shot(page, "compound-list");

    await page.fill('input[name="q"]', "BS-003");
    await page.click('button:has-text("Search")');
    await page.locator(".ag-row", { hasText: "BS-003" }).first().waitFor({ timeout: 15_000 });
    // AG Grid positions rows absolutely, so the DOM order is not the display order: ask for row 0
    // (the exact name ranks before names that are only similar).
    await page.waitForFunction(
      () => [...document.querySelectorAll('.ag-row[row-index="0"]')].some((r) => r.textContent?.includes("BS-003")),
      undefined,
      { timeout: 15_000 },
    );

    await page.fill('input[name="q"]', "");
    await page.fill('input[name="substructure"]', "c1ccc2[nH]cnc2c1");
    await page.click('button:has-text("Search")');
    await page.getByText("passed the fingerprint prefilter").waitFor({ timeout: 15_000 });
    // The benzimidazole series (75 invented compounds) contains the fragment; the others do not.
    await expect(page.getByTestId("result-count").innerText()).resolves.toMatch(/of 75$/);
    await shot(page, "compound-list-substructure");
    await page.close();
  });

  it("shows a compound page with properties and units, batches, stocks and the results section", async () => {
    const page = await newPage(browser);
    await signIn(page, "viewer@example.org");
    await page.goto(`${APP_URL}/compounds/INH-000001`);
    await expect(page.locator("h1").innerText()).resolves.toBe("INH-000001");
    for (const text of ["g/mol", "Å²", "Batches", "Stock solutions", "Results across campaigns", "Chemical safety."]) {
      await expect(page.getByText(text, { exact: false }).first().isVisible()).resolves.toBe(true);
    }
    // A viewer reads but sees no write controls.
    await expect(page.getByText("Add a batch").count()).resolves.toBe(0);
    await shot(page, "compound-page");
    await page.goto(`${APP_URL}/compounds`);
    await expect(page.getByRole("link", { name: "Register compound" }).count()).resolves.toBe(0);
    // A partner-lab viewer reads only the compounds of their campaigns, and is told so.
    await page.getByText("You see the compounds of your campaigns").waitFor({ timeout: 15_000 });
    await page.getByTestId("result-count").waitFor({ timeout: 15_000 });
    await shot(page, "compound-list-viewer");
    await page.close();
  });

  it("previews a structure while typing and offers a batch for a structure already registered", async () => {
    const page = await newPage(browser);
    await signIn(page, "chemist@example.org");
    // The structure of INH-000001, read from its page.
    await page.goto(`${APP_URL}/compounds/INH-000001`);
    const smiles = (await page.locator('[title="Canonical SMILES (openchemlib)"]').innerText()).trim();
    await page.goto(`${APP_URL}/compounds/register`);
    await page.fill("#smiles", "C1CC");
    await page.getByText("unclosed ring").waitFor({ timeout: 20_000 });
    await page.fill("#smiles", smiles);
    await page.getByText("Molecular weight").waitFor({ timeout: 20_000 });
    await page.click('button:has-text("Register compound")');
    await page.getByRole("link", { name: "Add a batch to INH-000001" }).waitFor({ timeout: 20_000 });
    await shot(page, "compound-register-duplicate");
    await page.close();
  });

  it("checks a larger upload on worker threads in the built app", async () => {
    const page = await newPage(browser);
    await signIn(page, "chemist@example.org");
    const lines = ["smiles,name"];
    for (let i = 0; i < 700; i++)
      lines.push(
        `${"C".repeat(1 + (i % 25))}Oc1ccc(cc1)S(=O)(=O)N${"C".repeat(1 + Math.floor(i / 25))}${i % 2 ? "Cl" : "Br"},E2E-W-${i + 1} (invented)`,
      );
    const up = await page.request.post(`${APP_URL}/api/compound-imports`, {
      multipart: { file: { name: "workers.csv", mimeType: "text/csv", buffer: Buffer.from(lines.join("\n")) } },
    });
    expect(up.status()).toBe(202);
    const { id } = (await up.json()) as { id: string };
    let job: { status: string; preview?: { threads: number; valid: number } } = { status: "stored" };
    for (let k = 0; k < 120 && (job.status === "stored" || job.status === "preparing"); k++) {
      await page.waitForTimeout(1000);
      job = (await (await page.request.get(`${APP_URL}/api/compound-imports/${id}`)).json()) as typeof job;
    }
    expect(job.status).toBe("ready");
    expect(job.preview?.threads).toBe(2);
    expect(job.preview?.valid).toBe(700);
    await page.close();
  });

  it("imports a file with three bad records: preview, explicit mode, registration and report", async () => {
    const page = await newPage(browser);
    await signIn(page, "chemist@example.org");
    const rows = ["smiles,name,supplier,purity_pct,amount_mg"];
    for (let i = 1; i <= 12; i++) {
      const smiles = i === 4 ? "C1CC(=O)N" : i === 8 ? "CCXq" : `${"C".repeat(i + 2)}Oc1ccc(cc1)C(=O)NCC(F)(F)F`;
      rows.push(`${smiles},E2E-${i} (invented),Invented Supplier,${i === 11 ? "140" : "98"},5`);
    }
    const file = path.join(os.tmpdir(), `e2e-import-${Date.now()}.csv`);
    fs.writeFileSync(file, rows.join("\n"));
    await page.goto(`${APP_URL}/compounds/import`);
    await page.setInputFiles('input[name="file"]', file);
    await page.click('button:has-text("Upload and check")');
    await page.waitForURL(/\/compounds\/import\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    await page.getByText("Problems, record by record").waitFor({ timeout: 60_000 });
    await expect(page.getByTestId("invalid-count").innerText()).resolves.toBe("3");
    await expect(page.getByRole("button", { name: "Choose a mode first" }).isDisabled()).resolves.toBe(true);
    await shot(page, "compound-import-preview");
    await page.check('input[value="valid_only"]');
    await page.click('button:has-text("Register")');
    await page.getByText("Outcome").waitFor({ timeout: 30_000 });
    await expect(page.locator('section[aria-label="Outcome"]').innerText()).resolves.toMatch(/9 registered/);
    await shot(page, "compound-import-done");
    const report = await page.request.get(
      `${page.url().replace("/compounds/import/", "/api/compound-imports/")}/report`,
    );
    const text = await report.text();
    expect(
      text
        .split("\r\n")
        .filter((l) => l.includes(",not registered,"))
        .map((l) => Number(l.split(",")[0])),
    ).toEqual([4, 8, 11]);
    await page.close();
  });
});
