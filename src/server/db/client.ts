import "server-only";
import { drizzle } from "drizzle-orm/postgres-js";
import postgres from "postgres";
import { env } from "@/env";
import * as schema from "./schema";

function connect() {
  if (!env.DATABASE_URL)
    throw new Error(
      "DATABASE_URL is not set: start the app with `npm start`, or point DATABASE_URL at a PostgreSQL server.",
    );
  const client = postgres(env.DATABASE_URL, { onnotice: () => {}, max: 10, idle_timeout: 30 });
  return { client, db: drizzle(client, { schema }) };
}

// One pool per process, kept across hot reloads in development.
declare global {
  var __inhibitrackDb: ReturnType<typeof connect> | undefined;
}
const conn = globalThis.__inhibitrackDb ?? connect();
if (env.NODE_ENV !== "production") globalThis.__inhibitrackDb = conn;

export const db = conn.db;
export const sqlClient = conn.client;
export type Db = typeof db;
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
