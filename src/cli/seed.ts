// Loads the invented demo data (people, campaigns, and what later steps add) into an empty
// database. `--if-empty` makes it a no-op when any account exists. Never in production mode.
import { sql } from "drizzle-orm";
import { db, sqlClient } from "@/server/db/client";
import { env } from "@/env";
import { seedAccounts } from "@/server/seed/accounts";
import { seedCompounds } from "@/server/seed/compounds";
import { seedPlates } from "@/server/seed/plates";
import { seedAnalyses } from "@/server/seed/analyses";
import { seedHits } from "@/server/seed/hits";

const ifEmpty = process.argv.includes("--if-empty");

async function main() {
  if (env.INHIBITRACK_MODE === "production") {
    console.log("[seed] production mode: no demo data or demo accounts are loaded.");
    return;
  }
  if (env.DEMO_DATA !== "1") {
    console.log("[seed] DEMO_DATA is not 1: nothing to load.");
    return;
  }
  const [row] = await db.execute<{ n: number }>(sql`select count(*)::int as n from users`);
  if ((row?.n ?? 0) > 0) {
    if (ifEmpty) {
      console.log("[seed] the database already has data; demo data not loaded again.");
      return;
    }
    throw new Error("The database is not empty; refusing to load demo data over it.");
  }
  const t0 = Date.now();
  const ctx = await seedAccounts(db);
  console.log(`[seed] invented demo accounts and 2 campaigns loaded (${Date.now() - t0} ms)`);
  const tc = Date.now();
  const comp = await seedCompounds(db, ctx);
  console.log(
    `[seed] invented demo compounds: ${comp.compounds} registered with ${comp.batches} batches and ${comp.stocks} stock solutions (${Date.now() - tc} ms)`,
  );
  const t1 = Date.now();
  const plates = await seedPlates(db, ctx);
  console.log(
    `[seed] invented demo plates: ${plates.runs} runs stored with QC, ${plates.accepted} accepted (${Date.now() - t1} ms)`,
  );
  const t2 = Date.now();
  const an = await seedAnalyses(db, ctx);
  console.log(
    `[seed] invented demo analyses: ${an.experiments} experiments, ${an.results} compound results (${Date.now() - t2} ms)`,
  );
  const t3 = Date.now();
  const hits = await seedHits(db, ctx);
  console.log(
    `[seed] invented demo triage: ${hits.decisions} decisions, ${hits.comments} comments (${Date.now() - t3} ms)`,
  );
}

main()
  .catch((e) => {
    console.error(`[seed] failed: ${e instanceof Error ? e.stack : e}`);
    process.exitCode = 1;
  })
  .finally(() => sqlClient.end());
