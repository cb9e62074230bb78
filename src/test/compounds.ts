// Test set-up for compound tests: a registered compound with a batch, a library and a prepared
// import per world, stored through the real services. The structures are small INVENTED
// variations (alkyl chains on a phenol ether) chosen only to be distinct; they are not reference data.
import crypto from "node:crypto";
import { eq, inArray, sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compounds } from "@/server/db/schema";
import { env } from "@/env";
import { demoCompounds } from "@/lib/chem/demo-compounds";
import { formatRegistryId } from "@/server/registry-id";
import {
  registerCompound,
  createLibrary,
  insertCompounds,
  prepareStructure,
  startImport,
  type PreparedCompound,
} from "@/server/services/compounds";
import type { World } from "./harness";

/**
 * A structure that no other test uses: a phenyl ether whose chain is eight random segments of one
 * to four carbons, each closed by O, N or S (12⁸ ≈ 4·10⁸ chains). Test files run in parallel
 * processes against one database, so a counter alone repeated structures across files, and a
 * repeat is refused as already registered (seen once in CI).
 */
export function uniqueSmiles(): string {
  const chain = [...crypto.randomBytes(8)]
    .map((b) => "C".repeat(1 + (b % 4)) + ["O", "N", "S"][Math.floor(b / 4) % 3])
    .join("");
  return `C${chain}COc1ccc(cc1)C(=O)NC`;
}

const cache = new Map<string, Promise<{ registryId: string; libraryId: string; importId: string }>>();

/** A compound with batch 1, an empty library and a prepared (uncommitted) import, made once per world. */
export function compoundsWorld(w: World) {
  let p = cache.get(w.tag);
  if (!p) {
    p = (async () => {
      const admin = w.people.admin;
      const c = await registerCompound(admin, {
        // Random per world: a structure derived from the tag alone repeats once a run makes a few dozen worlds.
        smiles: uniqueSmiles(),
        name: `World ${w.tag} (invented)`,
        batch: { supplier: "Invented Supplier" },
      });
      const lib = await createLibrary(admin, { name: `World library ${w.tag}` });
      const imp = await importFile(w, `world-${w.tag}.csv`, `smiles,name\n${uniqueSmiles()},W1\n`);
      return { registryId: c.registryId, libraryId: lib.id, importId: imp };
    })();
    cache.set(w.tag, p);
  }
  return p;
}

/** Starts an import as the world's admin and waits until it is prepared; returns its id. */
export async function importFile(w: World, name: string, text: string): Promise<string> {
  const { job, done } = await startImport(w.people.admin, {
    fileName: name,
    contentType: "text/csv",
    bytes: new TextEncoder().encode(text),
  });
  await done;
  return job.id;
}

/**
 * Makes sure the given registry IDs (`INH-000001`…, as plate maps in other tests use them) exist,
 * registering INVENTED demo structures (src/lib/chem/demo-compounds.ts) through the registry's
 * own sequence until the highest wanted number is reached. A number the sequence skipped (a
 * rolled-back registration) is filled directly, which is safe because the sequence is past it.
 */
export async function ensureCompoundsRegistered(ids: string[]): Promise<void> {
  const prefix = env.REGISTRY_PREFIX;
  const wanted = [...new Set(ids)].map((id) => {
    if (!id.startsWith(prefix)) throw new Error(`ensureCompoundsRegistered: ${id} does not start with ${prefix}`);
    return Number(id.slice(prefix.length));
  });
  if (wanted.length === 0) return;
  const max = Math.max(...wanted);
  await db.transaction(async (tx) => {
    // One at a time across test files: the sequence and the unique structure keys are shared.
    await tx.execute(sql`select pg_advisory_xact_lock(5005)`);
    const seqRow = await tx.execute<{ last_value: string; is_called: boolean }>(
      sql`select last_value, is_called from compound_number_seq`,
    );
    const last = seqRow[0]!.is_called ? Number(seqRow[0]!.last_value) : 0;
    const taken = new Set((await tx.select({ key: compounds.structureKey }).from(compounds)).map((r) => r.key));
    const pool: PreparedCompound[] = [];
    for (const d of demoCompounds()) {
      if (pool.length >= max) break;
      const p = prepareStructure({ smiles: d.smiles });
      if (taken.has(p.properties.structureKey)) continue;
      taken.add(p.properties.structureKey);
      pool.push({
        properties: p.properties,
        fingerprintBits: p.fingerprintBits,
        name: `${d.name} (invented, test)`,
        aliases: [],
        batches: [],
        stocks: [],
      });
    }
    if (max > last) await insertCompounds(tx, null, pool.splice(0, max - last));
    const present = new Set(
      (
        await tx
          .select({ n: compounds.registryNumber })
          .from(compounds)
          .where(inArray(compounds.registryNumber, wanted))
      ).map((r) => r.n),
    );
    for (const n of wanted.filter((x) => !present.has(x))) {
      const p = pool.shift();
      if (!p) throw new Error("ensureCompoundsRegistered: ran out of invented structures");
      const [row] = await insertCompounds(tx, null, [p]);
      // Renumber the row just made to the skipped number.
      await tx
        .update(compounds)
        .set({ registryNumber: n, registryId: formatRegistryId(n) })
        .where(eq(compounds.id, row!.id));
    }
  });
}
