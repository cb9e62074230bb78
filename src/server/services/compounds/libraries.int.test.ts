// Compound libraries against the real Postgres: a library from a pasted list of registry IDs, all
// or nothing, and the library filter of the search. The structures are INVENTED test molecules.
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import { eq } from "drizzle-orm";
import { makeWorld, type World } from "@/test/harness";
import { compoundApi, type Json } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { db } from "@/server/db/client";
import { compoundLibraries } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { createLibrary } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { search, registerOrFind } = compoundApi(() => w);

describe("libraries", () => {
  it("creates a library from a pasted list, and refuses unknown IDs without creating anything", async () => {
    const ids = [await registerOrFind(uniqueSmiles()), await registerOrFind(uniqueSmiles())].map((x) => x.registryId);
    const name = `Follow-up ${crypto.randomBytes(3).toString("hex")} (invented)`;
    await expect(createLibrary(w.people.chemist, { name, ids: `${ids[0]}\nINH-999999` })).rejects.toThrow(
      /Not in the registry: INH-999999\. Nothing was added\./,
    );
    expect(await db.select().from(compoundLibraries).where(eq(compoundLibraries.name, name))).toHaveLength(0);
    const lib = await createLibrary(w.people.chemist, { name, ids: `${ids[0]}, ${ids[1]}\n${ids[0]}` });
    expect(lib.added).toBe(2);
    await expect(createLibrary(w.people.chemist, { name })).rejects.toThrow(AppError);
    const r = (await search(`library=${lib.id}`)).json as { items: Json[]; total: number };
    expect(r.items.map((i) => i.registryId).sort()).toEqual([...ids].sort());
  });
});
