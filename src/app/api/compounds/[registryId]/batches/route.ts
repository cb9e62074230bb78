import { requireCapabilityAnywhere, requireUser } from "@/server/auth/guard";
import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, parseJson, route } from "@/server/http";
import { addBatch, getCompound } from "@/server/services/compounds";
import { registryIdParam } from "../schema";
import { PostBatchBody, PostBatchResponse } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

/** A compound's batches, each with the stock solutions made from it (same visibility as the compound). */
export const GET = route<{ registryId: string }>(async (_req, params) => {
  const scope = await requireRegistryReader();
  const { registryId } = registryIdParam.parse(params);
  const c = await getCompound(scope, registryId);
  return json({
    registryId: c.registryId,
    items: c.batches.map((b) => ({ ...b, stocks: c.stocks.filter((s) => s.batchNumber === b.batchNumber) })),
    units: { purityPct: "%", concentrationMm: "mM", volumeUl: "µL" },
  });
});

/** Adds a batch (numbered next) to a compound, optionally with a stock solution (chemists, admins; audited). */
export const POST = route<{ registryId: string }>(async (req, params) => {
  await requireUser();
  const { registryId } = registryIdParam.parse(params);
  const body = await parseJson(req, PostBatchBody);
  const user = await requireCapabilityAnywhere("compound:write");
  const { batchNumber } = await addBatch(user, registryId, body.batch ?? {}, body.stock);
  return json({ registryId: registryId.toUpperCase(), batchNumber } satisfies z.infer<typeof PostBatchResponse>, 201);
});
