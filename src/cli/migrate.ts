// Applies the committed SQL migrations in drizzle/ (an explicit step of `npm start` and
// `npm test`, never of the build).
import { drizzle } from "drizzle-orm/postgres-js";
import { migrate } from "drizzle-orm/postgres-js/migrator";
import postgres from "postgres";

const url = process.env.DATABASE_URL;
if (!url) {
  console.error("DATABASE_URL is not set.");
  process.exit(2);
}
const client = postgres(url, { onnotice: () => {}, max: 1 });
try {
  await migrate(drizzle(client), { migrationsFolder: "drizzle" });
  console.log("[migrate] database schema is up to date");
} catch (e) {
  console.error(`[migrate] failed: ${e instanceof Error ? e.message : e}`);
  process.exitCode = 1;
} finally {
  await client.end();
}
