import { chromium, type Browser, type Page } from "playwright-core";
import fs from "node:fs";
import path from "node:path";

export const APP_URL = process.env.APP_URL ?? "http://127.0.0.1:3000";
export const ARTIFACTS = process.env.E2E_ARTIFACTS ?? path.resolve("artifacts/e2e");
export const DEMO_PASSWORD = "inhibitrack-demo";

/** Debian's chromium, headless, with background networking off (this machine has no internet). */
export async function launch(): Promise<Browser> {
  const executablePath = process.env.CHROMIUM_PATH || "/usr/bin/chromium";
  return chromium.launch({
    executablePath,
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--disable-dev-shm-usage",
    ],
  });
}

export async function newPage(browser: Browser): Promise<Page> {
  const ctx = await browser.newContext({ viewport: { width: 1360, height: 860 }, deviceScaleFactor: 1 });
  return ctx.newPage();
}

export async function shot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Signs in through the real form. */
export async function signIn(page: Page, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${APP_URL}/sign-in`);
  await page.fill('input[name="email"]', email);
  await page.fill('input[name="password"]', password);
  await Promise.all([
    page.waitForURL((u) => !u.pathname.startsWith("/sign-in"), { timeout: 30_000 }),
    page.click('button[type="submit"]'),
  ]);
}
