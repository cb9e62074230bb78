"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/server/action";
import { AppError } from "@/server/errors";
import { requireCapabilityAnywhere } from "@/server/auth/guard";
import {
  addBatch,
  addStock,
  addToLibrary,
  createLibrary,
  editCompound,
  registerCompound,
  removeFromLibrary,
} from "@/server/services/compounds";
import {
  aliasesSchema,
  batchSchema,
  registerCompoundSchema,
  safeText,
  safeTextRequired,
  stockSchema,
} from "@/lib/chem/validation";

/** Form fields named "batch.supplier" → { batch: { supplier } }, so the forms reuse the API's schemas. */
function nestDotted(raw: unknown): unknown {
  if (typeof raw !== "object" || raw === null) return raw;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(raw)) {
    const [head, ...rest] = k.split(".");
    if (!head) continue;
    if (rest.length === 0) out[head] = v;
    else {
      const inner = (out[head] ??= {}) as Record<string, unknown>;
      inner[rest.join(".")] = v;
    }
  }
  return out;
}

const registryId = z
  .string()
  .trim()
  .regex(/^[A-Za-z][A-Za-z0-9]{0,7}-\d{1,9}$/, "Not a registry ID (e.g. INH-000123).");
const libraryId = z.string().uuid("Not a library id.");

/**
 * Register a compound from the form. A duplicate answers 409 with the existing registry ID in
 * `fieldErrors.duplicateOf`, so the form can offer "add a batch to INH-…" instead.
 */
export const registerCompoundAction = formAction(z.preprocess(nestDotted, registerCompoundSchema), async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  try {
    const r = await registerCompound(user, input);
    revalidatePath("/compounds");
    return {
      ok: true,
      data: { registryId: r.registryId, warnings: r.warnings },
      message: `Registered as ${r.registryId}.`,
    };
  } catch (e) {
    if (e instanceof AppError && e.code === "conflict" && typeof e.extra?.registryId === "string") {
      const fieldErrors: Record<string, string> = { duplicateOf: e.extra.registryId };
      if (e.extra.reason === "needs_distinct_reason")
        fieldErrors.distinctReason = "Give a reason to register this stereo form as a distinct compound.";
      return { ok: false, error: e.message, fieldErrors, status: 409 };
    }
    throw e;
  }
});

const addBatchSchema = z.preprocess(
  nestDotted,
  z.object({ registryId, batch: batchSchema.default({}), stock: stockSchema.optional() }),
);

/** Add a batch (numbered next) to a compound, optionally with a stock solution made from it. */
export const addBatchAction = formAction(addBatchSchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const { batchNumber } = await addBatch(user, input.registryId, input.batch, input.stock);
  revalidatePath(`/compounds/${input.registryId.toUpperCase()}`);
  return {
    ok: true,
    data: { batchNumber },
    message: `Batch ${batchNumber} added to ${input.registryId.toUpperCase()}.`,
  };
});

const addStockSchema = z.preprocess(
  nestDotted,
  z.object({
    registryId,
    batchNumber: z.coerce.number().int("Choose a batch.").min(1, "Choose a batch."),
    stock: stockSchema,
  }),
);

/** Record a stock solution made from one batch. */
export const addStockAction = formAction(addStockSchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  await addStock(user, input.registryId, input.batchNumber, input.stock);
  revalidatePath(`/compounds/${input.registryId.toUpperCase()}`);
  return { ok: true, message: `Stock solution recorded for batch ${input.batchNumber}.` };
});

const editSchema = z.object({
  registryId,
  name: safeText(200),
  aliases: aliasesSchema,
  smiles: z.preprocess(
    (v) => (v === "" ? undefined : v),
    z.string().trim().max(2000, "SMILES is longer than 2000 characters.").optional(),
  ),
  reason: safeText(500),
});

/** Edit names and aliases, or the structure (with a reason; audited with before and after). */
export const editCompoundAction = formAction(editSchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  await editCompound(user, input.registryId, {
    name: input.name ?? "",
    aliases: input.aliases ?? [],
    smiles: input.smiles,
    reason: input.reason,
  });
  revalidatePath(`/compounds/${input.registryId.toUpperCase()}`);
  return { ok: true, message: input.smiles ? "Structure updated; the change is in the audit log." : "Names updated." };
});

const createLibrarySchema = z.object({
  name: safeTextRequired(120).refine((s) => s.trim().length > 0, "Give the library a name."),
  description: safeText(1000),
  ids: z.string().max(200_000, "Paste at most 200,000 characters of IDs.").optional(),
});

/** Create a library, optionally filled from a pasted list of registry IDs (all found, or nothing is created). */
export const createLibraryAction = formAction(createLibrarySchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const { id, added } = await createLibrary(user, input);
  revalidatePath("/compounds/libraries");
  return { ok: true, data: { id }, message: `Library created with ${added} compound${added === 1 ? "" : "s"}.` };
});

const addToLibrarySchema = z.object({
  libraryId,
  ids: z.string().trim().min(1, "Give at least one registry ID.").max(200_000),
});

/** Add compounds to a library by registry ID (pasted list or one ID). */
export const addToLibraryAction = formAction(addToLibrarySchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const r = await addToLibrary(user, input.libraryId, input.ids);
  revalidatePath(`/compounds/libraries/${input.libraryId}`);
  return { ok: true, message: `${r.added} added${r.already ? `; ${r.already} already in the library` : ""}.` };
});

const removeSchema = z.object({ libraryId, registryId });

/** Remove one compound from a library. */
export const removeFromLibraryAction = formAction(removeSchema, async (input) => {
  const user = await requireCapabilityAnywhere("compound:write");
  await removeFromLibrary(user, input.libraryId, input.registryId);
  revalidatePath(`/compounds/libraries/${input.libraryId}`);
  return { ok: true, message: `${input.registryId.toUpperCase()} removed from the library.` };
});
