// Calls of the compound registry's route handlers as the people of a test world, shared by the
// compound tests in src/server/services/compounds/. The structures the tests register are INVENTED
// unless a test names their outside reference.
import { expect } from "vitest";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import * as compoundsRoute from "@/app/api/compounds/route";
import * as compoundRoute from "@/app/api/compounds/[registryId]/route";
import * as importsRoute from "@/app/api/compound-imports/route";
import * as importRoute from "@/app/api/compound-imports/[importId]/route";
import * as commitRoute from "@/app/api/compound-imports/[importId]/commit/route";
import { waitForImport } from "@/server/services/compounds";
import { callRoute, type World } from "./harness";

export type Json = Record<string, unknown>;

/** Rows in compounds, batches and stock solutions, to check that a refused write wrote nothing. */
export const counts = async () => {
  const [r] = await db.execute<{ c: number; b: number; s: number }>(
    sql`select (select count(*)::int from compounds) as c, (select count(*)::int from compound_batches) as b, (select count(*)::int from stock_solutions) as s`,
  );
  return r!;
};

/** The routes of the registry, called as the world's people; `world()` is read at call time (set in beforeAll). */
export function compoundApi(world: () => World) {
  const post = (body: unknown, who: "chemist" | "admin" = "chemist") =>
    callRoute(compoundsRoute.POST, { user: world().people[who], method: "POST", path: "/api/compounds", body });
  // Reads as the chemist by default: a registry role sees the whole registry; viewers see only
  // their campaigns' compounds (src/server/auth/compound-access.ts, tested in registry-access.int.test.ts).
  type Reader = "viewer" | "chemist" | "assay" | "lead" | "nonMember" | "admin";
  const getOne = (registryId: string, who: Reader = "chemist") =>
    callRoute(compoundRoute.GET, {
      user: world().people[who],
      path: `/api/compounds/${registryId}`,
      params: { registryId },
    });
  const search = (qs: string, who: Reader = "chemist") =>
    callRoute(compoundsRoute.GET, { user: world().people[who], path: `/api/compounds?${qs}` });

  /** Registers, or finds the registry ID when an earlier test file registered the same structure. */
  async function registerOrFind(
    smiles: string,
    name?: string,
  ): Promise<{ registryId: string; created: boolean; json: Json }> {
    const r = await post({ smiles, name });
    if (r.status === 201)
      return { registryId: (r.json as Json).registryId as string, created: true, json: r.json as Json };
    expect(r.status).toBe(409);
    return { registryId: (r.json as Json).registryId as string, created: false, json: r.json as Json };
  }

  /** Uploads a file for bulk import as the chemist, waits for its preparation and returns the job view. */
  const upload = async (name: string, text: string | Uint8Array<ArrayBuffer>) => {
    const form = new FormData();
    form.append("file", new File([text], name, { type: "application/octet-stream" }));
    const r = await callRoute(importsRoute.POST, {
      user: world().people.chemist,
      method: "POST",
      path: "/api/compound-imports",
      body: form,
    });
    expect(r.status).toBe(202);
    const id = (r.json as Json).id as string;
    await waitForImport(id);
    return {
      id,
      view: (
        await callRoute(importRoute.GET, {
          user: world().people.chemist,
          path: `/api/compound-imports/${id}`,
          params: { importId: id },
        })
      ).json as Json,
    };
  };
  const commit = (id: string, mode: string) =>
    callRoute(commitRoute.POST, {
      user: world().people.chemist,
      method: "POST",
      path: `/api/compound-imports/${id}/commit`,
      params: { importId: id },
      body: { mode },
    });

  return { post, getOne, search, registerOrFind, upload, commit };
}
