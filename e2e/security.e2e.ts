// Browser and HTTP checks of the security headers against the built app with the invented demo
// campaign: the headers on a page and an API route, no Content-Security-Policy violation on the
// main pages (hit grid, dose-response and mechanism results, a plate run's heatmaps, the Z′
// trend), and a hostile plate barcode shown as text in the chart's hover label. Header values are
// common practice (OWASP Secure Headers Project, from memory).
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import postgres from "postgres";
import type { Browser, Page } from "playwright-core";
import { launch, newPage, shot, signIn, APP_URL } from "./lib/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launch();
});
afterAll(async () => {
  await browser?.close();
});

const HOSTILE = "<b>x</b><img src=x onerror=alert(1)>";

/** Records CSP violations and script errors of a page from before its first script runs. */
async function watched(): Promise<{ page: Page; problems: () => Promise<string[]> }> {
  const page = await newPage(browser);
  const errors: string[] = [];
  page.on("console", (m) => {
    if (/Content Security Policy|Refused to/i.test(m.text())) errors.push(`${page.url()}: ${m.text().slice(0, 160)}`);
  });
  page.on("pageerror", (e) => errors.push(`pageerror: ${e.message}`));
  page.on("dialog", (d) => {
    errors.push(`dialog: ${d.message()}`);
    void d.dismiss();
  });
  await page.addInitScript(() => {
    const w = window as unknown as { __csp: string[] };
    w.__csp = [];
    document.addEventListener("securitypolicyviolation", (e) =>
      w.__csp.push(`${e.violatedDirective} blocked ${e.blockedURI} at ${e.sourceFile}:${e.lineNumber}`),
    );
  });
  const problems = async () => [
    ...errors,
    ...(await page.evaluate(() => (window as unknown as { __csp?: string[] }).__csp ?? [])),
  ];
  return { page, problems };
}

describe("security headers", () => {
  it("sends them on a page and on an API route, with a fresh script nonce per page", async () => {
    const [a, b, api] = await Promise.all([
      fetch(`${APP_URL}/sign-in`),
      fetch(`${APP_URL}/sign-in`),
      fetch(`${APP_URL}/api/health`),
    ]);
    for (const r of [a, api]) {
      expect(r.headers.get("x-frame-options")).toBe("DENY");
      expect(r.headers.get("x-content-type-options")).toBe("nosniff");
      expect(r.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(r.headers.get("content-security-policy")).toContain("frame-ancestors 'none'");
    }
    const csp = a.headers.get("content-security-policy")!;
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
    expect(nonce).toBeTruthy();
    expect(b.headers.get("content-security-policy")).not.toContain(nonce);
    expect(csp).not.toContain("'unsafe-eval'");
    expect(api.headers.get("content-security-policy")).toContain("default-src 'none'");
    // Every script Next wrote carries this request's nonce.
    const html = await a.text();
    const scripts = html.match(/<script\b[^>]*>/g) ?? [];
    expect(scripts.length).toBeGreaterThan(0);
    expect(scripts.filter((s) => !s.includes(`nonce="${nonce}"`))).toEqual([]);
  });

  it("the main pages, their charts and the hit grid run with no CSP violation", async () => {
    const { page, problems } = await watched();
    await signIn(page, "lead@example.org");
    await page
      .getByRole("link", { name: /Vetrase-2/ })
      .first()
      .click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    const base = new URL(page.url()).pathname;

    await page.goto(`${APP_URL}${base}/hits`);
    await page.locator(".ag-row").first().waitFor({ timeout: 30_000 });
    await shot(page, "csp-hits");

    await page.goto(`${APP_URL}${base}/analyses`);
    await page
      .getByRole("link", { name: /Dose-response confirmation/ })
      .first()
      .click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: /INH-/ }).first().click();
    await page.waitForURL(/INH-\d+$/);
    await page.locator(".js-plotly-plot").first().waitFor({ timeout: 30_000 });
    await shot(page, "csp-dose-response");

    await page.goto(`${APP_URL}${base}/analyses`);
    await page
      .getByRole("link", { name: /Mechanism study/ })
      .first()
      .click();
    await page.waitForURL(/\/analyses\/[0-9a-f-]{36}$/);
    await page.locator("table a", { hasText: /INH-/ }).first().click();
    await page.waitForURL(/INH-\d+$/);
    await page.locator(".js-plotly-plot").nth(1).waitFor({ timeout: 30_000 });
    await shot(page, "csp-mechanism");

    await page.goto(`${APP_URL}${base}/plates`);
    await page.locator(".js-plotly-plot").first().waitFor({ timeout: 30_000 });
    await page.getByRole("link", { name: "screen-13.csv" }).click();
    await page.getByTestId("heatmap-raw").locator(".js-plotly-plot").waitFor({ timeout: 30_000 });
    await page.getByTestId("heatmap-raw").locator(".nsewdrag").first().hover();
    await shot(page, "csp-plate-run");

    expect(await problems()).toEqual([]);
    await page.close();
  });

  it("the other pages run with no CSP violation either (registry, compound, digest, team, settings, signed-out pages)", async () => {
    const { page, problems } = await watched();
    await page.goto(`${APP_URL}/forgot-password`);
    await page.locator("form").first().waitFor();
    await page.goto(`${APP_URL}/digest/stop/not-a-valid-link`);
    await page.getByText("This link is not valid").waitFor();
    await signIn(page, "admin@example.org");
    await page
      .getByRole("link", { name: /Vetrase-2/ })
      .first()
      .click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    const base = new URL(page.url()).pathname;
    for (const p of ["/digest", "/team", "/analyses", "/no-such-page"]) {
      await page.goto(`${APP_URL}${base}${p}`);
      await page.locator("h1").first().waitFor();
    }
    await page.goto(`${APP_URL}/compounds`);
    await page.locator("h1").first().waitFor();
    await page.goto(`${APP_URL}/compounds/INH-000001`);
    await page.locator("h1").first().waitFor();
    await page.waitForLoadState("networkidle");
    await shot(page, "csp-compound");
    await page.goto(`${APP_URL}/compounds/register`);
    await page.locator("h1").first().waitFor();
    await page.goto(`${APP_URL}/settings`);
    await page.locator("h1").first().waitFor();
    await page.goto(`${APP_URL}/admin/audit`);
    await page.locator("h1").first().waitFor();
    expect(await problems()).toEqual([]);
    await page.close();
  });

  it("shows a barcode with markup as text in the Z′ trend's hover label", async () => {
    const { page, problems } = await watched();
    await signIn(page, "assay@example.org");
    await page
      .getByRole("link", { name: /Vetrase-2/ })
      .first()
      .click();
    await page.waitForURL(/\/campaigns\/[0-9a-f-]{36}$/);
    const base = new URL(page.url()).pathname;
    // The invented fixture export with one value changed, so it is a new file (not a repeat).
    const src = fs.readFileSync(path.resolve("fixtures/plates/single-dose-96.long.csv"), "utf8");
    const file = path.join(os.tmpdir(), `hostile-barcode-${Date.now()}.csv`);
    fs.writeFileSync(
      file,
      src.replace(/^A1,(\d+)/m, (_, v) => `A1,${Number(v) + 1 + (Date.now() % 97)}`),
    );
    // A 96-well map of its own (the invented fixture map), then the upload screen for it.
    await page.goto(`${APP_URL}${base}/plates/maps/new`);
    await page.selectOption("select:near(:text('Format'))", "96");
    await page.setInputFiles(
      'input[aria-label="Import plate map CSV"]',
      path.resolve("fixtures/plates/single-dose-96.map.csv"),
    );
    await page.getByText("The plate map is complete").waitFor();
    await page.fill('input[name="name"]', `E2E hostile barcode map ${Date.now()} (invented)`);
    await Promise.all([
      page.waitForURL(/\/plates\/maps\/[0-9a-f-]{36}$/, { timeout: 30_000 }),
      page.getByRole("button", { name: "Save as a new plate map" }).click(),
    ]);
    await page.getByRole("link", { name: "Upload exports for this map" }).click();
    await page.waitForURL(/\/plates\/upload/);
    await page.fill("#barcode", HOSTILE);
    await page.setInputFiles("#export-files", file);
    await page
      .getByTestId("parse-report")
      .getByText(/96 wells/)
      .waitFor({ timeout: 30_000 });
    await Promise.all([
      page.waitForURL(/\/plates\/runs\/[0-9a-f-]{36}$/, { timeout: 60_000 }),
      page.getByRole("button", { name: "Store and parse" }).click(),
    ]);
    // The run page writes the barcode as text.
    await page.getByText(`barcode ${HOSTILE}`, { exact: false }).first().waitFor();

    await page.goto(`${APP_URL}${base}/plates`);
    const chart = page.locator(".js-plotly-plot").first();
    await chart.waitFor({ timeout: 30_000 });
    // Hover over the points until the hover label shows ours (the newest run); the toolbar, which
    // can sit over the newest point, is hidden first.
    await page.addStyleTag({ content: ".modebar-container { display: none !important; }" });
    const points = chart.locator(".scatterlayer .point");
    let label = "";
    for (let k = (await points.count()) - 1; k >= 0 && !label.includes("onerror"); k--) {
      await points.nth(k).hover({ force: true });
      await page.waitForTimeout(50);
      label = (await chart.locator(".hoverlayer").textContent()) ?? "";
    }
    expect(label).toContain(HOSTILE);
    // Shown as characters: no element was made from the barcode's markup, nothing ran.
    expect(await chart.locator(".hoverlayer img, .hoverlayer b, .hoverlayer tspan[style*='bold']").count()).toBe(0);
    await shot(page, "csp-hostile-barcode");
    expect(await problems()).toEqual([]);
    await page.close();
  });

  it("counts a failed sign-in against the TCP peer, not a client-sent X-Forwarded-For", async () => {
    const ctx = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": "203.0.113.99" } });
    const page = await ctx.newPage();
    await page.goto(`${APP_URL}/sign-in`);
    await page.fill('input[name="email"]', "nobody-e2e@example.invalid");
    await page.fill('input[name="password"]', "not-the-password");
    await page.click('button[type="submit"]');
    await page.getByText("That e-mail and password do not match an account.").waitFor({ timeout: 15_000 });
    const sql = postgres(process.env.DATABASE_URL!, { onnotice: () => {} });
    try {
      const rows = await sql<{ bucket: string }[]>`select bucket from throttle where bucket like 'signin:address:%'`;
      const buckets = rows.map((r) => r.bucket);
      expect(buckets).not.toContain("signin:address:203.0.113.99");
      expect(buckets).toContain("signin:address:127.0.0.1");
    } finally {
      await sql.end();
      await ctx.close();
    }
  });
});
