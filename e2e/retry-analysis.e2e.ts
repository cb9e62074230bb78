// Browser journey: a failed analysis on the invented demo campaign shows its reason and a retry
// button to an assay scientist; the retry queues it again and the worker (started by `npm test`
// as under `npm start`) finishes it. The failure is set up in the database (an analysis of the
// same inputs as the experiment's current one, marked failed with an invented reason), as a
// worker that stopped three times would leave it.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import type { Browser, Page } from "playwright-core";
import postgres from "postgres";
import path from "node:path";
import { launch, newPage, signIn, APP_URL, ARTIFACTS } from "./lib/browser";

let browser: Browser;
let page: Page;
const sql = postgres(process.env.DATABASE_URL!, { onnotice: () => {} });
beforeAll(async () => {
  browser = await launch();
  page = await newPage(browser);
  await signIn(page, "assay@example.org");
});
afterAll(async () => {
  await browser?.close();
  await sql.end();
});

describe("retrying a failed analysis", () => {
  it("shows the failure with a retry button, and the retry is run by the worker", async () => {
    const [current] = await sql<{ id: string; experimentId: string; campaignId: string }[]>`
      select a.id, a.experiment_id as "experimentId", a.campaign_id as "campaignId"
      from analyses a join experiments e on e.id = a.experiment_id
      where a.is_current and e.kind = 'single-dose' order by a.requested_at limit 1`;
    expect(current).toBeDefined();
    const [failed] = await sql<{ id: string }[]>`
      insert into analyses (experiment_id, campaign_id, status, engine_version, input_hash, inputs, requested_by,
                            started_at, finished_at, attempts, error)
      select experiment_id, campaign_id, 'failed', engine_version, input_hash, inputs, requested_by,
             now(), now(), 3,
             'The worker stopped 3 times while running this analysis (invented for this test)'
      from analyses where id = ${current!.id}
      returning id`;
    await page.goto(`${APP_URL}/campaigns/${current!.campaignId}/analyses/${current!.experimentId}`);
    await page.getByText("The last analysis failed").waitFor({ timeout: 15_000 });
    const button = page.getByRole("button", { name: "Retry the failed analysis" });
    await button.waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, "analysis-failed-retry.png") }); // the top of the page
    await button.click();
    await expect
      .poll(
        async () => (await sql<{ status: string }[]>`select status from analyses where id = ${failed!.id}`)[0]?.status,
        { timeout: 60_000, interval: 500 },
      )
      .toBe("done");
    const audits = await sql`select 1 from audit_log where action = 'analysis.retry' and entity_id = ${failed!.id}`;
    expect(audits).toHaveLength(1);
    await page.reload();
    await page.getByText("The results below are up to date").waitFor({ timeout: 15_000 });
    expect(await page.getByRole("button", { name: "Retry the failed analysis" }).count()).toBe(0);
    await page.screenshot({ path: path.join(ARTIFACTS, "analysis-retried.png") });
  }, 120_000);
});
