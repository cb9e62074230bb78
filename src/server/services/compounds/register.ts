import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { compoundBatches, compounds, stockSolutions } from "@/server/db/schema";
import { isUniqueViolation } from "@/server/db/sql-helpers";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import type { BatchInput, CompoundProperties, RegisterCompoundInput, StockInput } from "@/lib/chem";
import { audit } from "../audit";
import { compoundByRegistryId } from "./read";
import {
  batchValues,
  hasBatchData,
  hasStockData,
  insertCompounds,
  prepareStructureOffThread,
  stockValues,
  structureColumns,
} from "./write";

async function existingByKey(tx: Tx | typeof db, structureKey: string) {
  const [row] = await tx
    .select({ id: compounds.id, registryId: compounds.registryId })
    .from(compounds)
    .where(eq(compounds.structureKey, structureKey))
    .limit(1);
  return row;
}

function duplicateError(registryId: string): AppError {
  return new AppError(
    "conflict",
    `This structure is already registered as ${registryId}. Add a new batch to ${registryId} instead.`,
    {
      extra: { registryId, reason: "duplicate" },
    },
  );
}

export type RegisterResult = {
  id: string;
  registryId: string;
  properties: CompoundProperties;
  batchNumber: number | null;
  warnings: string[];
};

/**
 * Registers one compound from the register form or `POST /api/compounds`. The same structure
 * (structure key) → 409 with the existing registry ID; another stereo form of a registered
 * structure (same flat key) → 409 unless a `distinctReason` is given. Salt components removed
 * from the input become the batch's salt form. One transaction with its audit row.
 */
export async function registerCompound(actor: Actor, input: RegisterCompoundInput): Promise<RegisterResult> {
  const prep = await prepareStructureOffThread(input);
  const p = prep.properties;
  const warnings = [...prep.warnings];
  let batch = input.batch;
  if (prep.removedComponents.length > 0) {
    const salt = prep.removedComponents.join(".");
    if (!batch?.saltForm) {
      batch = { ...batch, saltForm: salt.slice(0, 100) };
      warnings.push(`Kept the largest component; recorded "${salt}" as the batch's salt form.`);
    } else warnings.push(`Kept the largest component; removed ${salt}.`);
  }
  const wantsBatch = hasBatchData(batch) || hasStockData(input.stock);
  try {
    return await db.transaction(async (tx) => {
      const dup = await existingByKey(tx, p.structureKey);
      if (dup) throw duplicateError(dup.registryId);
      if (!input.distinctReason) {
        const siblings = await tx
          .select({ registryId: compounds.registryId })
          .from(compounds)
          .where(eq(compounds.flatKey, p.flatKey))
          .orderBy(asc(compounds.registryNumber))
          .limit(5);
        if (siblings.length > 0) {
          const ids = siblings.map((s) => s.registryId);
          throw new AppError(
            "conflict",
            `Another stereo form of this structure is registered as ${ids.join(", ")}. To register this one as a distinct compound, give a reason (e.g. "stereo-unknown form"); otherwise add a batch to ${ids[0]}.`,
            { extra: { registryId: ids[0], sameFlatStructure: ids, reason: "needs_distinct_reason" } },
          );
        }
      }
      const [created] = await insertCompounds(tx, actor, [
        {
          properties: p,
          fingerprintBits: prep.fingerprintBits,
          molfile: input.molfile ?? null,
          name: input.name ?? null,
          aliases: input.aliases ?? [],
          distinctReason: input.distinctReason ?? null,
          batches: wantsBatch ? [batch ?? {}] : [],
          stocks: hasStockData(input.stock) ? [{ ...input.stock!, batchIndex: 0 }] : [],
        },
      ]);
      await audit(tx, actor, {
        action: "compound.register",
        entityType: "compound",
        entityId: created!.registryId,
        after: {
          registryId: created!.registryId,
          smiles: p.canonicalSmiles,
          formula: p.formula,
          name: input.name ?? null,
          distinctReason: input.distinctReason ?? null,
        },
        reason: input.distinctReason ?? null,
      });
      return {
        id: created!.id,
        registryId: created!.registryId,
        properties: p,
        batchNumber: wantsBatch ? 1 : null,
        warnings,
      };
    });
  } catch (e) {
    // Two people registering the same structure at once: the unique index decides.
    if (isUniqueViolation(e, "compounds_structure_key")) {
      const dup = await existingByKey(db, p.structureKey);
      if (dup) throw duplicateError(dup.registryId);
    }
    throw e;
  }
}

/** Adds a batch (numbered next) to a registered compound, optionally with a stock solution made from it. */
export async function addBatch(
  actor: Actor,
  registryId: string,
  batch: BatchInput,
  stock?: StockInput,
): Promise<{ batchNumber: number }> {
  return db.transaction(async (tx) => {
    const c = await compoundByRegistryId(tx, registryId, true);
    const [last] = await tx
      .select({ n: sql<number>`coalesce(max(${compoundBatches.batchNumber}), 0)::int` })
      .from(compoundBatches)
      .where(eq(compoundBatches.compoundId, c.id));
    const batchNumber = (last?.n ?? 0) + 1;
    const [b] = await tx
      .insert(compoundBatches)
      .values(batchValues(c.id, batchNumber, batch, actor))
      .returning({ id: compoundBatches.id });
    if (hasStockData(stock)) await tx.insert(stockSolutions).values(stockValues(b!.id, stock!, actor));
    await audit(tx, actor, {
      action: "compound.batch.add",
      entityType: "compound",
      entityId: c.registryId,
      after: { batchNumber, ...batch },
    });
    return { batchNumber };
  });
}

/** Records a stock solution made from batch `batchNumber` of a compound; returns the new stock's id. */
export async function addStock(
  actor: Actor,
  registryId: string,
  batchNumber: number,
  stock: StockInput,
): Promise<{ id: string }> {
  return db.transaction(async (tx) => {
    const c = await compoundByRegistryId(tx, registryId);
    const [b] = await tx
      .select({ id: compoundBatches.id })
      .from(compoundBatches)
      .where(and(eq(compoundBatches.compoundId, c.id), eq(compoundBatches.batchNumber, batchNumber)));
    if (!b) throw new AppError("not_found", `${c.registryId} has no batch ${batchNumber}.`);
    const [row] = await tx
      .insert(stockSolutions)
      .values(stockValues(b.id, stock, actor))
      .returning({ id: stockSolutions.id });
    await audit(tx, actor, {
      action: "compound.stock.add",
      entityType: "compound",
      entityId: c.registryId,
      after: { batchNumber, ...stock },
    });
    return { id: row!.id };
  });
}

/**
 * Edits a compound's names and, optionally, its structure. A structure edit recomputes every
 * property and the fingerprint, refuses a structure registered under another ID, and is audited
 * with the old and new structure and the reason (same transaction).
 */
export async function editCompound(
  actor: Actor,
  registryId: string,
  input: { name?: string; aliases?: string[]; smiles?: string; molfile?: string; reason?: string },
): Promise<void> {
  const prep =
    input.smiles !== undefined || input.molfile !== undefined ? await prepareStructureOffThread(input) : null;
  if (prep && !input.reason)
    throw new AppError("bad_request", "A structure edit needs a reason (it is recorded in the audit log).", {
      details: [{ field: "reason", message: "Give a reason for the structure edit." }],
    });
  await db.transaction(async (tx) => {
    const c = await compoundByRegistryId(tx, registryId, true);
    const set: Partial<typeof compounds.$inferInsert> = { updatedAt: new Date() };
    if (input.name !== undefined) set.name = input.name;
    if (input.aliases !== undefined) set.aliases = input.aliases;
    if (prep) {
      const dup = await existingByKey(tx, prep.properties.structureKey);
      if (dup && dup.id !== c.id) throw duplicateError(dup.registryId);
      Object.assign(set, structureColumns(prep.properties, input.molfile, prep.fingerprintBits));
    }
    await tx.update(compounds).set(set).where(eq(compounds.id, c.id));
    await audit(tx, actor, {
      action: prep ? "compound.structure.edit" : "compound.names.edit",
      entityType: "compound",
      entityId: c.registryId,
      before: { name: c.name, aliases: c.aliases, ...(prep ? { smiles: c.canonicalSmiles, formula: c.formula } : {}) },
      after: {
        name: set.name ?? c.name,
        aliases: set.aliases ?? c.aliases,
        ...(prep ? { smiles: prep.properties.canonicalSmiles, formula: prep.properties.formula } : {}),
      },
      reason: input.reason ?? null,
    });
  });
}
