// Test set-up for plate batches: batches of the INVENTED small plate (src/test/plates.ts) made
// through the real batch service, once per world for the role matrix.
import { createBatch } from "@/server/services/plates/batches";
import { db } from "@/server/db/client";
import { plateBatchFiles } from "@/server/db/schema";
import { and, eq } from "drizzle-orm";
import type { World } from "./harness";
import { campaignRow, platesWorld, smallExport } from "./plates";

const cache = new Map<string, Promise<{ batchId: string; mapId: string }>>();

/** A processed batch in the world's campaign: one stored file and one unmatched file. */
export function batchWorld(w: World): Promise<{ batchId: string; mapId: string }> {
  let p = cache.get(w.tag);
  if (!p) {
    p = (async () => {
      const { mapId } = await platesWorld(w);
      const { id } = await createBatch(
        w.people.assay,
        await campaignRow(w.campaignId),
        {
          files: [
            {
              name: "stored.csv",
              contentType: "text/csv",
              bytes: smallExport(50_000 + (Number.parseInt(w.tag, 16) % 1000)),
            },
          ],
          defaultPlateMapId: mapId,
        },
        { wait: true },
      );
      return { batchId: id, mapId };
    })();
    cache.set(w.tag, p);
  }
  return p;
}

/** A fresh batch with one unmatched file (no default plate map, a name matching no map). */
export async function unmatchedFile(
  w: World,
  salt: number,
): Promise<{ batchId: string; fileId: string; mapId: string }> {
  const { mapId } = await platesWorld(w);
  const { id } = await createBatch(
    w.people.assay,
    await campaignRow(w.campaignId),
    { files: [{ name: `nomatch-${salt}.csv`, contentType: "text/csv", bytes: smallExport(60_000 + salt) }] },
    { wait: true },
  );
  const [f] = await db
    .select({ id: plateBatchFiles.id })
    .from(plateBatchFiles)
    .where(and(eq(plateBatchFiles.batchId, id), eq(plateBatchFiles.outcome, "unmatched")));
  return { batchId: id, fileId: f!.id, mapId };
}
