// Browser journey for personal API tokens on the invented demo data: the assay scientist creates
// a read token limited to the demo campaign in settings, sees the secret once, uses it from a
// script (plain fetch, no cookie, no Origin), revokes it, and the next call gets 401.
// Screenshots tokens-created.png and tokens-revoked.png.
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

describe("personal API tokens", () => {
  it("created in settings, shown once, usable by a script, revoked at once", async () => {
    const page = await newPage(browser);
    await signIn(page, "assay@example.org");
    await page.goto(`${APP_URL}/settings`);
    await page.getByRole("heading", { name: "API tokens" }).waitFor();
    await page.getByLabel("Name").fill("Reader PC upload script (invented)");
    await page.getByLabel("Read only").check();
    await page.getByLabel(/Only chosen campaigns/).check();
    await page.getByLabel(/Vetrase-2/).check();
    await page.getByLabel(/Expires after/).fill("30");
    await page.getByRole("button", { name: "Create token" }).click();
    const box = page.getByTestId("new-token");
    await box.waitFor();
    const secret = (await box.locator("code").innerText()).trim();
    expect(secret).toMatch(/^itk_[A-Za-z0-9_-]{43}$/);
    const row = page.getByRole("row", { name: /Reader PC upload script/ });
    await expect(row.innerText()).resolves.toMatch(/Read only\s+Vetrase-2/);
    await shot(page, "tokens-created");

    // A script: bearer only.
    const call = (path: string, init: RequestInit = {}) =>
      fetch(`${APP_URL}${path}`, { ...init, headers: { authorization: `Bearer ${secret}`, ...init.headers } });
    const me = await call("/api/campaigns");
    expect(me.status).toBe(200);
    const mint = await call("/api/tokens", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ name: "x", scope: "read" }),
    });
    expect(mint.status).toBe(403);

    // The secret is not shown again after a reload.
    await page.reload();
    await page.getByRole("row", { name: /Reader PC upload script/ }).waitFor();
    await expect(page.getByText(secret).count()).resolves.toBe(0);

    page.once("dialog", (d) => void d.accept());
    await page
      .getByRole("row", { name: /Reader PC upload script/ })
      .getByRole("button", { name: "Revoke" })
      .click();
    await page.getByRole("row", { name: /Reader PC upload script.*revoked/ }).waitFor();
    await shot(page, "tokens-revoked");
    const after = await call("/api/campaigns");
    expect(after.status).toBe(401);
    expect(((await after.json()) as { error: string }).error).toMatch(/^This API token was revoked on/);
  });
});
