// Browser journey for the API reference: a chemist of the invented demo campaign opens the page,
// sees the operations grouped by resource with who may call each, and the raw document it is
// rendered from answers without a sign-in; screenshot api-reference.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser } from "playwright-core";
import { APP_URL, launch, newPage, shot, signIn } from "./lib/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

describe("API reference", () => {
  it("lists the operations of the served document, grouped by resource", async () => {
    const res = await fetch(`${APP_URL}/api/openapi.json`);
    expect(res.status).toBe(200);
    const doc = (await res.json()) as { openapi: string; paths: Record<string, Record<string, unknown>> };
    expect(doc.openapi).toBe("3.1.0");
    const count = Object.values(doc.paths).reduce((n, m) => n + Object.keys(m).length, 0);

    const page = await newPage(browser);
    await signIn(page, "chemist@example.org");
    await page.goto(`${APP_URL}/api-reference`);
    await page.getByRole("heading", { name: "API reference" }).waitFor();
    expect(await page.locator("article").count()).toBe(count);
    await expect(page.getByRole("heading", { name: "Plate runs" }).isVisible()).resolves.toBe(true);
    await expect(
      page.getByText("/api/campaigns/{campaignId}/hits/{registryId}", { exact: true }).first().isVisible(),
    ).resolves.toBe(true);
    await expect(
      page
        .getByText(/Research use only/)
        .first()
        .isVisible(),
    ).resolves.toBe(true);
    await shot(page, "api-reference");
  });
});
