// Test set-up for compound tests: a registered compound with a batch, a library and a prepared
// import per world, stored through the real services. The structures are small INVENTED
// variations (alkyl chains on a phenol ether) chosen only to be distinct; they are not reference data.
import crypto from "node:crypto";
import { registerCompound, createLibrary } from "@/server/services/compounds";
import { startImport } from "@/server/services/compound-imports";
import type { World } from "./harness";

/** A structure that no other test uses: a phenyl ether with a chain length taken from a counter. */
let counter = 0;
export function uniqueSmiles(): string {
  counter += 1;
  const n = 3 + (counter % 40);
  const m = 1 + Math.floor(counter / 40) + (crypto.randomBytes(1)[0]! % 30);
  return `${"C".repeat(n)}Oc1ccc(cc1)C(=O)N${"C".repeat(m)}`;
}

const cache = new Map<string, Promise<{ registryId: string; libraryId: string; importId: string }>>();

/** A compound with batch 1, an empty library and a prepared (uncommitted) import, made once per world. */
export function compoundsWorld(w: World) {
  let p = cache.get(w.tag);
  if (!p) {
    p = (async () => {
      const admin = w.people.admin;
      const c = await registerCompound(admin, { smiles: `c1ccc2ccccc2c1C(=O)N${"C".repeat(2 + (parseInt(w.tag, 16) % 50))}O`, name: `World ${w.tag} (invented)`, batch: { supplier: "Invented Supplier" } });
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
  const { job, done } = await startImport(w.people.admin, { fileName: name, contentType: "text/csv", bytes: new TextEncoder().encode(text) });
  await done;
  return job.id;
}
