import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import {
  compoundBatches,
  compoundLibraries,
  compounds,
  libraryMembers,
  stockSolutions,
  users,
} from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { compoundNotFound, visibleCompoundSql, type CompoundScope } from "@/server/auth/compound-access";

export type CompoundRow = typeof compounds.$inferSelect;

/** One compound by registry ID (case and surrounding spaces ignored); 404 naming it when it is not registered. */
export async function compoundByRegistryId(tx: Tx | typeof db, registryId: string, forUpdate = false) {
  const q = tx.select().from(compounds).where(eq(compounds.registryId, registryId.trim().toUpperCase())).limit(1);
  const [row] = forUpdate ? await q.for("update") : await q;
  if (!row) throw new AppError("not_found", `No compound ${registryId.slice(0, 40)} in the registry.`);
  return row;
}

/** The public shape of a compound (API and screens). Units: mw g/mol, exactMass Da, tpsa Å². */
export function compoundSummary(c: CompoundRow) {
  return {
    id: c.id,
    registryId: c.registryId,
    name: c.name,
    aliases: c.aliases,
    smiles: c.canonicalSmiles,
    formula: c.formula,
    mw: c.mwGPerMol,
    exactMass: c.exactMassDa,
    heavyAtoms: c.heavyAtoms,
    clogp: c.clogp,
    hbd: c.hbd,
    hba: c.hba,
    tpsa: c.tpsaA2,
    rotatableBonds: c.rotatableBonds,
    distinctReason: c.distinctReason,
    registeredAt: c.registeredAt.toISOString(),
  };
}
export type CompoundSummary = ReturnType<typeof compoundSummary>;

export const PROPERTY_UNITS = { mw: "g/mol", exactMass: "Da", tpsa: "Å²", clogp: "log units (octanol/water)" } as const;

/**
 * One compound with its batches, stock solutions and libraries (the compound page and its API),
 * if the reader's scope includes it (compound-access.ts); 404 otherwise, as for an unknown ID.
 */
export async function getCompound(scope: CompoundScope, registryId: string) {
  const id = registryId.trim().toUpperCase();
  const [c] = await db
    .select()
    .from(compounds)
    .where(and(eq(compounds.registryId, id), visibleCompoundSql(scope, compounds.registryId)))
    .limit(1);
  if (!c) throw compoundNotFound(registryId);
  const [batchRows, stockRows, libs, who] = await Promise.all([
    db
      .select({ b: compoundBatches, by: users.name })
      .from(compoundBatches)
      .leftJoin(users, eq(users.id, compoundBatches.registeredBy))
      .where(eq(compoundBatches.compoundId, c.id))
      .orderBy(asc(compoundBatches.batchNumber)),
    db
      .select({ s: stockSolutions, batchNumber: compoundBatches.batchNumber })
      .from(stockSolutions)
      .innerJoin(compoundBatches, eq(compoundBatches.id, stockSolutions.batchId))
      .where(eq(compoundBatches.compoundId, c.id))
      .orderBy(asc(compoundBatches.batchNumber), asc(stockSolutions.createdAt)),
    db
      .select({ id: compoundLibraries.id, name: compoundLibraries.name })
      .from(libraryMembers)
      .innerJoin(compoundLibraries, eq(compoundLibraries.id, libraryMembers.libraryId))
      .where(eq(libraryMembers.compoundId, c.id))
      .orderBy(asc(compoundLibraries.name)),
    c.registeredBy
      ? db.select({ name: users.name }).from(users).where(eq(users.id, c.registeredBy))
      : Promise.resolve([]),
  ]);
  return {
    ...compoundSummary(c),
    structureKey: c.structureKey,
    molfile: c.molfile,
    registeredBy: who[0]?.name ?? null,
    units: PROPERTY_UNITS,
    batches: batchRows.map(({ b, by }) => ({
      batchNumber: b.batchNumber,
      supplier: b.supplier,
      purityPct: b.purityPct,
      amount: b.amount,
      amountUnit: b.amountUnit,
      saltForm: b.saltForm,
      date: b.batchDate,
      notes: b.notes,
      registeredBy: by,
      registeredAt: b.registeredAt.toISOString(),
    })),
    stocks: stockRows.map(({ s, batchNumber }) => ({
      id: s.id,
      batchNumber,
      concentrationMm: s.concentrationMm,
      solvent: s.solvent,
      volumeUl: s.volumeUl,
      location: s.location,
      madeOn: s.madeOn,
    })),
    libraries: libs,
  };
}
export type CompoundDetail = Awaited<ReturnType<typeof getCompound>>;

/** Rows in compounds, for tests that check nothing was written. */
export async function countCompounds(): Promise<number> {
  const [r] = await db.select({ n: sql<number>`count(*)::int` }).from(compounds);
  return r?.n ?? 0;
}
