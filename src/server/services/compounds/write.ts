import "server-only";
import { sql } from "drizzle-orm";
import type { Tx } from "@/server/db/client";
import { compoundBatches, compounds, stockSolutions } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { formatRegistryId } from "@/server/registry-id";
import {
  computeProperties,
  fingerprint,
  parseStructure,
  toBitString,
  type BatchInput,
  type CompoundProperties,
  type StockInput,
} from "@/lib/chem";
import { runChem } from "./prepare-pool";

/** A structure already parsed and computed, with what the registration adds to it. */
export type PreparedCompound = {
  properties: CompoundProperties;
  fingerprintBits: string;
  molfile?: string | null;
  name?: string | null;
  aliases?: string[];
  distinctReason?: string | null;
  batches: BatchInput[];
  /** Stock solutions, each made from `batches[batchIndex]`. */
  stocks: (StockInput & { batchIndex: number })[];
};

export function hasBatchData(b: BatchInput | undefined): boolean {
  return !!b && Object.values(b).some((v) => v !== undefined && v !== "");
}

export function hasStockData(s: StockInput | undefined): boolean {
  return !!s && Object.values(s).some((v) => v !== undefined && v !== "");
}

/** Rows per multi-row INSERT. */
export const CHUNK = 1000;
export function chunks<T>(xs: readonly T[], n = CHUNK): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < xs.length; i += n) out.push(xs.slice(i, i + n));
  return out;
}

/** The compound columns that follow from its structure (registration and structure edits). */
export function structureColumns(p: CompoundProperties, molfile: string | null | undefined, fingerprint: string) {
  return {
    structureKey: p.structureKey,
    flatKey: p.flatKey,
    canonicalSmiles: p.canonicalSmiles,
    molfile: molfile ?? null,
    formula: p.formula,
    mwGPerMol: p.mwGPerMol,
    exactMassDa: p.exactMassDa,
    heavyAtoms: p.heavyAtomCount,
    clogp: p.clogp,
    hbd: p.hbd,
    hba: p.hba,
    tpsaA2: p.tpsaA2,
    rotatableBonds: p.rotatableBonds,
    fingerprint,
  };
}

/** `count` registry numbers from the sequence, ascending, so the first item registered gets the lowest ID. */
export async function drawRegistryNumbers(tx: Tx, count: number): Promise<number[]> {
  const rows = await tx.execute<{ n: number }>(
    sql`select nextval('compound_number_seq')::int as n from generate_series(1, ${count}::int)`,
  );
  return rows.map((r) => Number(r.n)).sort((a, b) => a - b);
}

/**
 * Inserts compounds (and their batches and stocks) inside the caller's transaction, in order:
 * registry numbers are drawn from the sequence and given in ascending order, so the first item
 * gets the lowest ID. Multi-row INSERTs of up to 1,000 rows. A structure key that is already
 * registered fails the whole transaction with a unique violation (the caller checked before).
 */
export async function insertCompounds(
  tx: Tx,
  actor: Actor | null,
  items: readonly PreparedCompound[],
): Promise<{ id: string; registryId: string }[]> {
  if (items.length === 0) return [];
  const numbers = await drawRegistryNumbers(tx, items.length);
  const out: { id: string; registryId: string }[] = [];
  const rows = items.map((it, i) => {
    const p = it.properties;
    const n = numbers[i]!;
    return {
      registryId: formatRegistryId(n),
      registryNumber: n,
      name: it.name ?? null,
      aliases: it.aliases ?? [],
      ...structureColumns(p, it.molfile, it.fingerprintBits),
      distinctReason: it.distinctReason ?? null,
      registeredBy: actor?.id ?? null,
    };
  });
  for (const part of chunks(rows)) {
    const ids = await tx
      .insert(compounds)
      .values(part)
      .returning({ id: compounds.id, registryId: compounds.registryId });
    out.push(...ids);
  }
  // Batches: numbered 1… per compound, in the order given.
  const batchRows: (typeof compoundBatches.$inferInsert)[] = [];
  const batchOwner: { item: number; index: number }[] = [];
  items.forEach((it, i) => {
    it.batches.forEach((b, k) => {
      batchRows.push(batchValues(out[i]!.id, k + 1, b, actor));
      batchOwner.push({ item: i, index: k });
    });
  });
  const batchIds = new Map<string, string>();
  for (const [c, part] of chunks(batchRows).entries()) {
    const ids = await tx.insert(compoundBatches).values(part).returning({ id: compoundBatches.id });
    ids.forEach((r, j) => {
      const owner = batchOwner[c * CHUNK + j]!;
      batchIds.set(`${owner.item}:${owner.index}`, r.id);
    });
  }
  const stockRows: (typeof stockSolutions.$inferInsert)[] = [];
  items.forEach((it, i) => {
    for (const s of it.stocks) {
      const batchId = batchIds.get(`${i}:${s.batchIndex}`);
      if (!batchId)
        throw new AppError("bad_request", `Stock solution refers to batch ${s.batchIndex + 1}, which is not given.`);
      stockRows.push(stockValues(batchId, s, actor));
    }
  });
  for (const part of chunks(stockRows)) await tx.insert(stockSolutions).values(part);
  return out;
}

export function batchValues(
  compoundId: string,
  batchNumber: number,
  b: BatchInput,
  actor: Actor | null,
): typeof compoundBatches.$inferInsert {
  return {
    compoundId,
    batchNumber,
    supplier: b.supplier ?? null,
    purityPct: b.purityPct ?? null,
    amount: b.amount ?? null,
    amountUnit: b.amountUnit ?? null,
    saltForm: b.saltForm ?? null,
    batchDate: b.date ?? null,
    notes: b.notes ?? null,
    registeredBy: actor?.id ?? null,
  };
}

export function stockValues(batchId: string, s: StockInput, actor: Actor | null): typeof stockSolutions.$inferInsert {
  return {
    batchId,
    concentrationMm: s.concentrationMm ?? null,
    solvent: s.solvent ?? null,
    volumeUl: s.volumeUl ?? null,
    location: s.location ?? null,
    madeOn: s.date ?? null,
    createdBy: actor?.id ?? null,
  };
}

type Prepared = ReturnType<typeof prepareStructure>;

/**
 * prepareStructure in the chemistry worker pool, for requests: the server's event loop does not
 * run openchemlib. A structure that is not chemistry or over the size caps is a 400 naming the
 * problem; one that overruns the time limit a 413 (prepare-pool.ts).
 */
export async function prepareStructureOffThread(input: { smiles?: string; molfile?: string }): Promise<Prepared> {
  const field = input.smiles !== undefined ? "smiles" : "molfile";
  const r = await runChem<({ ok: true } & Prepared) | { ok: false; error: string }>(
    {
      kind: "prepare",
      input: input.smiles !== undefined ? { smiles: input.smiles } : { molfile: input.molfile ?? "" },
    },
    "Preparing this structure",
  );
  if (!r.ok) throw new AppError("bad_request", r.error, { details: [{ field, message: r.error }] });
  return {
    properties: r.properties,
    fingerprintBits: r.fingerprintBits,
    removedComponents: r.removedComponents,
    warnings: r.warnings,
  };
}

/**
 * Parses one structure for registration in the calling thread (seed and test set-up); a structure
 * that is not chemistry is a 400 naming the problem. Requests use prepareStructureOffThread.
 */
export function prepareStructure(input: { smiles?: string; molfile?: string }) {
  const parsed = parseStructure(
    input.smiles !== undefined ? { smiles: input.smiles } : { molfile: input.molfile ?? "" },
  );
  if (!parsed.ok)
    throw new AppError("bad_request", parsed.error, {
      details: [{ field: input.smiles !== undefined ? "smiles" : "molfile", message: parsed.error }],
    });
  const properties = computeProperties(parsed.molecule);
  return {
    properties,
    fingerprintBits: toBitString(fingerprint(parsed.molecule, false)),
    removedComponents: parsed.removedComponents,
    warnings: parsed.warnings,
  };
}
