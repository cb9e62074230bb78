import "server-only";
import type { Db } from "@/server/db/client";
import { demoCompounds } from "@/lib/chem/demo-compounds";
import { createLibrary, insertCompounds, prepareStructure, type PreparedCompound } from "@/server/services/compounds";
import { audit } from "@/server/services/audit";

/**
 * INVENTED demo compounds (src/lib/chem/demo-compounds.ts: 300 compounds in four invented series,
 * with batches and stock solutions), registered through the registry service by the demo chemist
 * in one transaction. They get INH-000001 … INH-000300 in the generator's order, which the demo
 * plates rely on; the seed refuses to run when the registry is not empty.
 */
export async function seedCompounds(
  db: Db,
  ctx: { userIds: Record<string, string> },
): Promise<{ compounds: number; batches: number; stocks: number }> {
  const chemistId = ctx.userIds["chemist@example.org"];
  if (!chemistId) throw new Error("seedCompounds: the demo chemist is missing");
  const chemist = { id: chemistId, email: "chemist@example.org" };
  const demo = demoCompounds();
  const items: PreparedCompound[] = demo.map((d) => {
    const p = prepareStructure({ smiles: d.smiles });
    return {
      properties: p.properties,
      fingerprintBits: p.fingerprintBits,
      name: d.name,
      aliases: d.aliases,
      batches: d.batches,
      stocks: d.stocks,
    };
  });
  const ids = await db.transaction(async (tx) => {
    const created = await insertCompounds(tx, chemist, items);
    await audit(tx, chemist, {
      action: "compound.import",
      entityType: "compound_import",
      entityId: null,
      after: {
        source: "invented demo data",
        registered: created.length,
        first: created[0]?.registryId,
        last: created.at(-1)?.registryId,
      },
    });
    return created;
  });
  const expectedFirst = ids[0]?.registryId.endsWith("000001");
  if (!expectedFirst)
    throw new Error(
      `seedCompounds: the demo compounds must start at 000001 but got ${ids[0]?.registryId}; seed an empty database.`,
    );
  // Two invented libraries: the first series' first 24 compounds, and every fifth compound.
  await createLibrary(chemist, {
    name: "AP series follow-up (invented demo)",
    description: "Invented demo library: aminopyrimidine carboxamides picked for dose-response.",
    ids: ids
      .slice(0, 24)
      .map((i) => i.registryId)
      .join("\n"),
  });
  await createLibrary(chemist, {
    name: "Diversity set (invented demo)",
    description: "Invented demo library: every fifth registered compound.",
    ids: ids
      .filter((_, i) => i % 5 === 0)
      .map((i) => i.registryId)
      .join("\n"),
  });
  return {
    compounds: ids.length,
    batches: demo.reduce((n, d) => n + d.batches.length, 0),
    stocks: demo.reduce((n, d) => n + d.stocks.length, 0),
  };
}
