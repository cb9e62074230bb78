// The compound registry's JSON API (batches, stocks, structure edit, libraries) against real
// Postgres: happy path, bad input and wrong role for each. Compounds and names are invented;
// the role rules are the roles table of the product design (docs/product.md).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { callRoute, makeWorld, type TestUser, type World } from "@/test/harness";
import { uniqueSmiles } from "@/test/compounds";
import { registerCompound } from "@/server/services/compounds";
import { stopBoss } from "@/server/jobs/boss";
import * as compoundRoute from "./route";
import * as batchesRoute from "./batches/route";
import * as stocksRoute from "./batches/[batchNumber]/stocks/route";
import * as librariesRoute from "@/app/api/libraries/route";
import * as libraryRoute from "@/app/api/libraries/[libraryId]/route";
import * as membersRoute from "@/app/api/libraries/[libraryId]/members/route";
import * as memberRoute from "@/app/api/libraries/[libraryId]/members/[registryId]/route";
import * as auditRoute from "@/app/api/audit/route";
import { PostBatchResponse } from "./batches/schema";
import { PostStockResponse } from "./batches/[batchNumber]/stocks/schema";
import { PostLibraryResponse } from "@/app/api/libraries/schema";

type Json = Record<string, unknown>;

let w: World;
let chemist: TestUser;
let viewer: TestUser;
let registryId: string;

/** The newest audit rows naming an entity, read through the admin's audit API. */
async function auditOf(action: string) {
  const r = await callRoute(auditRoute.GET, {
    user: w.people.admin,
    path: `/api/audit?action=${encodeURIComponent(action)}&limit=20`,
  });
  expect(r.status).toBe(200);
  return (r.json as { items: Json[] }).items;
}

beforeAll(async () => {
  w = await makeWorld();
  chemist = w.people.chemist;
  viewer = w.people.viewer;
  const c = await registerCompound(w.people.admin, {
    smiles: uniqueSmiles(),
    name: `API compound ${w.tag} (invented)`,
    batch: { supplier: "Invented Supplier" },
  });
  registryId = c.registryId;
});
afterAll(() => stopBoss());

describe("batches and stocks", () => {
  it("a chemist adds batch 2 with a stock; GET lists both batches with the stock under batch 2, with units", async () => {
    const post = await callRoute(batchesRoute.POST, {
      user: chemist,
      method: "POST",
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
      body: {
        batch: { supplier: "Invented Labs", purityPct: 98.5, amount: 12, amountUnit: "mg" },
        stock: { concentrationMm: 10, solvent: "DMSO", volumeUl: 500 },
      },
    });
    expect(post.status).toBe(201);
    expect(PostBatchResponse.parse(post.json)).toEqual({ registryId, batchNumber: 2 });

    const get = await callRoute(batchesRoute.GET, {
      user: chemist,
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
    });
    expect(get.status).toBe(200);
    const j = get.json as { items: { batchNumber: number; purityPct: number; stocks: Json[] }[]; units: Json };
    expect(j.items.map((b) => b.batchNumber)).toEqual([1, 2]);
    expect(j.items[1]!.purityPct).toBe(98.5);
    expect(j.items[0]!.stocks).toEqual([]);
    expect(j.items[1]!.stocks).toMatchObject([{ concentrationMm: 10, solvent: "DMSO", volumeUl: 500 }]);
    expect(j.units).toMatchObject({ concentrationMm: "mM", volumeUl: "µL", purityPct: "%" });
    expect((await auditOf("compound.batch.add")).some((a) => a.entityId === registryId)).toBe(true);
  });

  it("a stock of batch 1 is recorded (201 with its id) and listed under batch 1 only", async () => {
    const post = await callRoute(stocksRoute.POST, {
      user: chemist,
      method: "POST",
      path: `/api/compounds/${registryId}/batches/1/stocks`,
      params: { registryId, batchNumber: "1" },
      body: { concentrationMm: 20, solvent: "DMSO", location: "Freezer 2 / Rack B / A07" },
    });
    expect(post.status).toBe(201);
    const { id } = PostStockResponse.parse(post.json);
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const get = await callRoute(stocksRoute.GET, {
      user: chemist,
      path: `/api/compounds/${registryId}/batches/1/stocks`,
      params: { registryId, batchNumber: "1" },
    });
    expect(get.status).toBe(200);
    expect((get.json as { items: Json[] }).items.map((s) => s.id)).toEqual([id]);
  });

  it("bad input: a purity over 100 %, an amount without unit, an empty stock, an unknown field, a missing batch", async () => {
    const batch = (body: unknown) =>
      callRoute(batchesRoute.POST, {
        user: chemist,
        method: "POST",
        path: `/api/compounds/${registryId}/batches`,
        params: { registryId },
        body,
      });
    const over = await batch({ batch: { purityPct: 140 } });
    expect(over.status).toBe(400);
    expect((over.json as { error: string }).error).toContain("batch.purityPct");
    const noUnit = await batch({ batch: { amount: 5 } });
    expect(noUnit.status).toBe(400);
    expect((noUnit.json as { error: string }).error).toContain("batch.amountUnit");
    expect((await batch({ batches: [] })).status).toBe(400);

    const stock = (batchNumber: string, body: unknown) =>
      callRoute(stocksRoute.POST, {
        user: chemist,
        method: "POST",
        path: `/api/compounds/${registryId}/batches/${batchNumber}/stocks`,
        params: { registryId, batchNumber },
        body,
      });
    expect((await stock("1", {})).status).toBe(400);
    expect((await stock("0", { solvent: "DMSO" })).status).toBe(400);
    const missing = await stock("99", { solvent: "DMSO" });
    expect(missing.status).toBe(404);
    expect((missing.json as { error: string }).error).toBe(`${registryId} has no batch 99.`);
  });

  it("wrong role: a viewer may not add a batch or a stock (403) and nothing is written", async () => {
    const before = await callRoute(batchesRoute.GET, {
      user: chemist,
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
    });
    const r = await callRoute(batchesRoute.POST, {
      user: viewer,
      method: "POST",
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
      body: { batch: { supplier: "Refused (invented)" } },
    });
    expect(r.status).toBe(403);
    const s = await callRoute(stocksRoute.POST, {
      user: viewer,
      method: "POST",
      path: `/api/compounds/${registryId}/batches/1/stocks`,
      params: { registryId, batchNumber: "1" },
      body: { solvent: "DMSO" },
    });
    expect(s.status).toBe(403);
    const after = await callRoute(batchesRoute.GET, {
      user: chemist,
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
    });
    expect(after.json).toEqual(before.json);
  });
});

describe("structure edit", () => {
  const patch = (user: TestUser, body: unknown, id = registryId) =>
    callRoute(compoundRoute.PATCH, {
      user,
      method: "PATCH",
      path: `/api/compounds/${id}`,
      params: { registryId: id },
      body,
    });

  it("a new SMILES with a reason recomputes the structure, answers the compound, and is audited with before, after and reason", async () => {
    const before = (
      await callRoute(compoundRoute.GET, {
        user: chemist,
        path: `/api/compounds/${registryId}`,
        params: { registryId },
      })
    ).json as Json;
    // Adding one CH2 to the chain: the formula gains C1H2 (common practice: a homologue).
    const smiles = `C${before.smiles as string}`;
    const r = await patch(chemist, { smiles, reason: "Corrected chain length after NMR (invented)" });
    expect(r.status).toBe(200);
    const after = r.json as Json;
    expect(after.registryId).toBe(registryId);
    expect(after.smiles).not.toBe(before.smiles);
    expect(after.mw as number).toBeCloseTo((before.mw as number) + 14.027, 1); // CH2 = 14.027 g/mol (IUPAC atomic weights, from memory)
    const rows = (await auditOf("compound.structure.edit")).filter((a) => a.entityId === registryId);
    expect(rows[0]).toMatchObject({
      reason: "Corrected chain length after NMR (invented)",
      before: { smiles: before.smiles },
      after: { smiles: after.smiles },
    });
  });

  it("names only: no reason needed; answers the new name", async () => {
    const r = await patch(chemist, { name: `Renamed ${w.tag} (invented)`, aliases: ["API-ALIAS-1"] });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ name: `Renamed ${w.tag} (invented)`, aliases: ["API-ALIAS-1"] });
  });

  it("bad input: no reason, both smiles and molfile, an unreadable SMILES, an empty body — 400 naming the field; the structure stays", async () => {
    const before = (
      await callRoute(compoundRoute.GET, {
        user: chemist,
        path: `/api/compounds/${registryId}`,
        params: { registryId },
      })
    ).json as Json;
    const noReason = await patch(chemist, { smiles: "CCO" });
    expect(noReason.status).toBe(400);
    expect((noReason.json as { details: { field: string }[] }).details[0]!.field).toBe("reason");
    const both = await patch(chemist, { smiles: "CCO", molfile: "x", reason: "r" });
    expect(both.status).toBe(400);
    expect((both.json as { error: string }).error).toContain("either a SMILES or a molfile");
    const unreadable = await patch(chemist, { smiles: "C1CC(", reason: "typo test" });
    expect(unreadable.status).toBe(400);
    expect((await patch(chemist, {})).status).toBe(400);
    const now = (
      await callRoute(compoundRoute.GET, {
        user: chemist,
        path: `/api/compounds/${registryId}`,
        params: { registryId },
      })
    ).json as Json;
    expect(now.smiles).toBe(before.smiles);
  });

  it("a structure registered under another ID is refused with 409 naming it", async () => {
    const smiles = uniqueSmiles();
    const other = await registerCompound(w.people.admin, { smiles, name: `Other ${w.tag} (invented)` });
    const r = await patch(chemist, { smiles, reason: "would duplicate" });
    expect(r.status).toBe(409);
    expect(JSON.stringify(r.json)).toContain(other.registryId);
  });

  it("wrong role: a viewer gets 403; signed out 401", async () => {
    expect((await patch(viewer, { name: "Nope" })).status).toBe(403);
    expect((await patch(null as unknown as TestUser, { name: "Nope" })).status).toBe(401);
  });
});

describe("libraries", () => {
  it("create with members, read, add (skipping ones already in), remove — all audited", async () => {
    const extra = await registerCompound(w.people.admin, { smiles: uniqueSmiles(), name: `Lib ${w.tag} (invented)` });
    const created = await callRoute(librariesRoute.POST, {
      user: chemist,
      method: "POST",
      path: "/api/libraries",
      body: { name: `API library ${w.tag}`, description: "Invented test set", registryIds: [registryId] },
    });
    expect(created.status).toBe(201);
    const { id: libraryId, added } = PostLibraryResponse.parse(created.json);
    expect(added).toBe(1);

    const list = await callRoute(librariesRoute.GET, { user: chemist, path: "/api/libraries" });
    expect((list.json as { items: Json[] }).items.find((l) => l.id === libraryId)).toMatchObject({ members: 1 });

    const add = await callRoute(membersRoute.POST, {
      user: chemist,
      method: "POST",
      path: `/api/libraries/${libraryId}/members`,
      params: { libraryId },
      body: { registryIds: [registryId, extra.registryId] },
    });
    expect(add.status).toBe(200);
    expect(add.json).toEqual({ libraryId, added: 1, already: 1 });

    const del = await callRoute(memberRoute.DELETE, {
      user: chemist,
      method: "DELETE",
      path: `/api/libraries/${libraryId}/members/${registryId}`,
      params: { libraryId, registryId },
    });
    expect(del.status).toBe(200);
    const one = await callRoute(libraryRoute.GET, {
      user: chemist,
      path: `/api/libraries/${libraryId}`,
      params: { libraryId },
    });
    expect((one.json as { members: { registryId: string }[] }).members.map((m) => m.registryId)).toEqual([
      extra.registryId,
    ]);
    const actions = (await auditOf("library.")).filter((a) => a.entityId === libraryId).map((a) => a.action);
    expect(actions.sort()).toEqual(["library.add", "library.create", "library.remove"]);
  });

  it("bad input: an unknown or malformed ID refuses the whole request; a duplicate name 409; removing a non-member 404", async () => {
    const name = `API library 2 ${w.tag}`;
    const unknown = await callRoute(librariesRoute.POST, {
      user: chemist,
      method: "POST",
      path: "/api/libraries",
      body: { name, registryIds: [registryId, "INH-999999999"] },
    });
    expect(unknown.status).toBe(400);
    expect((unknown.json as { error: string }).error).toContain("INH-999999999");
    const malformed = await callRoute(librariesRoute.POST, {
      user: chemist,
      method: "POST",
      path: "/api/libraries",
      body: { name, registryIds: ["not an id"] },
    });
    expect(malformed.status).toBe(400);
    expect((malformed.json as { error: string }).error).toContain("registryIds.0");
    // Nothing was created by the refused requests: the name is still free.
    const ok = await callRoute(librariesRoute.POST, {
      user: chemist,
      method: "POST",
      path: "/api/libraries",
      body: { name },
    });
    expect(ok.status).toBe(201);
    const again = await callRoute(librariesRoute.POST, {
      user: chemist,
      method: "POST",
      path: "/api/libraries",
      body: { name },
    });
    expect(again.status).toBe(409);
    const libraryId = (ok.json as { id: string }).id;
    const empty = await callRoute(membersRoute.POST, {
      user: chemist,
      method: "POST",
      path: `/api/libraries/${libraryId}/members`,
      params: { libraryId },
      body: { registryIds: [] },
    });
    expect(empty.status).toBe(400);
    const notIn = await callRoute(memberRoute.DELETE, {
      user: chemist,
      method: "DELETE",
      path: `/api/libraries/${libraryId}/members/${registryId}`,
      params: { libraryId, registryId },
    });
    expect(notIn.status).toBe(404);
  });

  it("wrong role: a viewer reads libraries but may not create or change one (403)", async () => {
    expect((await callRoute(librariesRoute.GET, { user: viewer, path: "/api/libraries" })).status).toBe(200);
    const r = await callRoute(librariesRoute.POST, {
      user: viewer,
      method: "POST",
      path: "/api/libraries",
      body: { name: `Viewer library ${w.tag}` },
    });
    expect(r.status).toBe(403);
  });
});
