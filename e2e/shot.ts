// Developer aid: screenshot a page, optionally signed in. npx tsx e2e/shot.ts /path out.png [email]
import { launch, newPage, signIn, APP_URL } from "./lib/browser";

const [p = "/", out = "artifacts/shot.png", email] = process.argv.slice(2);
const browser = await launch();
const page = await newPage(browser);
if (email) await signIn(page, email);
await page.goto(`${APP_URL}${p}`);
await page.waitForLoadState("networkidle");
await page.screenshot({ path: out, fullPage: true });
await browser.close();
console.log(out);
