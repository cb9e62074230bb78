import { requireCapabilityAnywhere, requireUser } from "@/server/auth/guard";
import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, parseJson, route } from "@/server/http";
import { AppError } from "@/server/errors";
import { addStock, getCompound } from "@/server/services/compounds";
import { PostStockBody, PostStockResponse, stocksParams } from "./schema";
import type { z } from "zod";

export const dynamic = "force-dynamic";

type P = { registryId: string; batchNumber: string };

/** The stock solutions made from one batch (same visibility as the compound). */
export const GET = route<P>(async (_req, params) => {
  const scope = await requireRegistryReader();
  const { registryId, batchNumber } = stocksParams.parse(params);
  const c = await getCompound(scope, registryId);
  if (!c.batches.some((b) => b.batchNumber === batchNumber))
    throw new AppError("not_found", `${c.registryId} has no batch ${batchNumber}.`);
  return json({
    registryId: c.registryId,
    batchNumber,
    items: c.stocks.filter((s) => s.batchNumber === batchNumber),
    units: { concentrationMm: "mM", volumeUl: "µL" },
  });
});

/** Records a stock solution made from one batch (chemists, admins; audited). 201 with its id. */
export const POST = route<P>(async (req, params) => {
  await requireUser();
  const { registryId, batchNumber } = stocksParams.parse(params);
  const body = await parseJson(req, PostStockBody);
  const user = await requireCapabilityAnywhere("compound:write");
  const { id } = await addStock(user, registryId, batchNumber, body);
  return json(
    { id, registryId: registryId.toUpperCase(), batchNumber } satisfies z.infer<typeof PostStockResponse>,
    201,
  );
});
