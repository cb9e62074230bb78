import "server-only";
import { and, asc, desc, eq, inArray, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import {
  analyses,
  campaigns,
  compoundBatches,
  compoundLibraries,
  compoundResults,
  compounds,
  experiments,
  libraryMembers,
  memberships,
  stockSolutions,
  users,
} from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { env } from "@/env";
import type { SessionUser } from "@/server/auth/session";
import { audit } from "./audit";
import {
  computeProperties,
  exactSearchPage,
  fingerprint,
  parseFragmentQuery,
  parseStructure,
  structureSvg,
  toBitString,
  type BatchInput,
  type CompoundProperties,
  type RegisterCompoundInput,
  type StockInput,
} from "@/lib/chem";

type Actor = Pick<SessionUser, "id" | "email">;
export type CompoundRow = typeof compounds.$inferSelect;

// ---------------------------------------------------------------- registry IDs

/** `INH-000123`: the installation's prefix and the sequence number, zero-padded to 6 digits. */
export function formatRegistryId(n: number): string {
  return `${env.REGISTRY_PREFIX}${String(n).padStart(6, "0")}`;
}

export function isUniqueViolation(e: unknown, constraint?: string): boolean {
  const get = (x: unknown, k: string) =>
    typeof x === "object" && x !== null && k in x ? (x as Record<string, unknown>)[k] : undefined;
  for (const err of [e, get(e, "cause")]) {
    if (
      get(err, "code") === "23505" &&
      (!constraint || get(err, "constraint_name") === constraint || get(err, "constraint") === constraint)
    )
      return true;
  }
  return false;
}

// ---------------------------------------------------------------- writing compounds

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

function hasBatchData(b: BatchInput | undefined): boolean {
  return !!b && Object.values(b).some((v) => v !== undefined && v !== "");
}

function hasStockData(s: StockInput | undefined): boolean {
  return !!s && Object.values(s).some((v) => v !== undefined && v !== "");
}

const CHUNK = 1000;
function chunks<T>(xs: readonly T[], n = CHUNK): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < xs.length; i += n) out.push(xs.slice(i, i + n));
  return out;
}

/** The compound columns that follow from its structure (registration and structure edits). */
function structureColumns(p: CompoundProperties, molfile: string | null | undefined, fingerprint: string) {
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
  const numbers = (
    await tx.execute<{ n: number }>(
      sql`select nextval('compound_number_seq')::int as n from generate_series(1, ${items.length}::int)`,
    )
  )
    .map((r) => Number(r.n))
    .sort((a, b) => a - b);
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

function batchValues(
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

function stockValues(batchId: string, s: StockInput, actor: Actor | null): typeof stockSolutions.$inferInsert {
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

/** Parses one structure for registration; a structure that is not chemistry is a 400 naming the problem. */
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
  const prep = prepareStructure(input);
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

async function compoundByRegistryId(tx: Tx | typeof db, registryId: string, forUpdate = false) {
  const q = tx.select().from(compounds).where(eq(compounds.registryId, registryId.trim().toUpperCase())).limit(1);
  const [row] = forUpdate ? await q.for("update") : await q;
  if (!row) throw new AppError("not_found", `No compound ${registryId.slice(0, 40)} in the registry.`);
  return row;
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

/** Records a stock solution made from batch `batchNumber` of a compound. */
export async function addStock(
  actor: Actor,
  registryId: string,
  batchNumber: number,
  stock: StockInput,
): Promise<void> {
  await db.transaction(async (tx) => {
    const c = await compoundByRegistryId(tx, registryId);
    const [b] = await tx
      .select({ id: compoundBatches.id })
      .from(compoundBatches)
      .where(and(eq(compoundBatches.compoundId, c.id), eq(compoundBatches.batchNumber, batchNumber)));
    if (!b) throw new AppError("not_found", `${c.registryId} has no batch ${batchNumber}.`);
    await tx.insert(stockSolutions).values(stockValues(b.id, stock, actor));
    await audit(tx, actor, {
      action: "compound.stock.add",
      entityType: "compound",
      entityId: c.registryId,
      after: { batchNumber, ...stock },
    });
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
  const prep = input.smiles !== undefined || input.molfile !== undefined ? prepareStructure(input) : null;
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

// ---------------------------------------------------------------- reading

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

export async function getCompound(registryId: string) {
  const c = await compoundByRegistryId(db, registryId);
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

// ---------------------------------------------------------------- search

export const SORT_FIELDS = {
  registryId: compounds.registryNumber,
  name: compounds.name,
  mw: compounds.mwGPerMol,
  clogp: compounds.clogp,
  heavyAtoms: compounds.heavyAtoms,
  tpsa: compounds.tpsaA2,
  registeredAt: compounds.registeredAt,
} as const;
export type SortField = keyof typeof SORT_FIELDS;

export type SearchInput = {
  q?: string;
  substructure?: string;
  limit: number;
  offset: number;
  sort?: SortField;
  dir?: "asc" | "desc";
  libraryId?: string;
  mwMin?: number;
  mwMax?: number;
  thumbnails?: boolean;
};

export type SearchResult = {
  items: (CompoundSummary & { svg?: string; rank?: string })[];
  total: number;
  totalIsLowerBound: boolean;
  /** For substructure queries: what the query was understood as, and how many rows the prefilter left. */
  substructure?: { understoodAs: string; candidates: number; checked: number; timedOut: boolean };
};

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (m) => `\\${m}`);

/** Rows allowed to enter the exact substructure check (in ranking order); more means "more than N". */
export const MAX_SUBSTRUCTURE_CANDIDATES = 20_000;
/** Time for the exact check of one request, in ms (the rest of the 1 s goal is the database). */
export const SUBSTRUCTURE_BUDGET_MS = 350;
/** Up to this many candidates are checked completely, with up to SMALL_SET_BUDGET_MS. */
export const SMALL_CANDIDATE_SET = 2_000;
export const SMALL_SET_BUDGET_MS = 2_000;

function filters(input: SearchInput): SQL[] {
  const where: SQL[] = [];
  if (input.libraryId)
    where.push(
      sql`exists (select 1 from ${libraryMembers} m where m.compound_id = ${compounds.id} and m.library_id = ${input.libraryId})`,
    );
  if (input.mwMin !== undefined) where.push(sql`${compounds.mwGPerMol} >= ${input.mwMin}`);
  if (input.mwMax !== undefined) where.push(sql`${compounds.mwGPerMol} <= ${input.mwMax}`);
  return where;
}

/**
 * Text ranking: 0 the exact registry ID (or its number, "123" → INH-000123), 1 a registry-ID
 * prefix, 2 an exact name or alias, 3 a name or alias prefix, 4 a name or alias containing the
 * text, 5 trigram-similar (pg_trgm `%`, default threshold 0.3); within a rank by similarity.
 */
function textQuery(q: string) {
  const text = q.trim();
  const lower = text.toLowerCase();
  const upper = text.toUpperCase();
  const asNumber = /^\d{1,9}$/.test(text) ? formatRegistryId(Number(text)) : null;
  const prefix = `${likeEscape(upper)}%`;
  const contains = `%${likeEscape(lower)}%`;
  const lowerPrefix = `${likeEscape(lower)}%`;
  const rank = sql<number>`case
    when ${compounds.registryId} = ${upper} or ${compounds.registryId} = ${asNumber} then 0
    when ${compounds.registryId} like ${prefix} then 1
    when lower(${compounds.name}) = ${lower} or exists (select 1 from unnest(${compounds.aliases}) a where lower(a) = ${lower}) then 2
    when lower(${compounds.name}) like ${lowerPrefix} or exists (select 1 from unnest(${compounds.aliases}) a where lower(a) like ${lowerPrefix}) then 3
    when lower(${compounds.name}) like ${contains} or exists (select 1 from unnest(${compounds.aliases}) a where lower(a) like ${contains}) then 4
    else 5 end`;
  const similarity = sql<number>`greatest(coalesce(similarity(lower(${compounds.name}), ${lower}), 0), coalesce((select max(similarity(lower(a), ${lower})) from unnest(${compounds.aliases}) a), 0))`;
  const where = sql`(${compounds.registryId} like ${prefix} or ${compounds.registryId} = ${asNumber}
    or lower(${compounds.name}) like ${contains} or lower(${compounds.name}) % ${lower}
    or exists (select 1 from unnest(${compounds.aliases}) a where lower(a) like ${contains} or lower(a) % ${lower}))`;
  return { rank, similarity, where };
}

const RANK_NAMES = [
  "registry ID",
  "registry ID prefix",
  "exact name or alias",
  "name or alias prefix",
  "name or alias contains",
  "similar name or alias",
];

export async function searchCompounds(input: SearchInput): Promise<SearchResult> {
  const where = filters(input);
  const text = input.q && input.q.trim() !== "" ? textQuery(input.q) : null;
  if (text) where.push(text.where);
  const dir = input.dir === "desc" ? desc : asc;
  const explicitSort = input.sort ? [dir(SORT_FIELDS[input.sort]), asc(compounds.registryNumber)] : null;
  const cond = where.length ? and(...where) : undefined;

  if (input.substructure && input.substructure.trim() !== "") {
    const query = parseFragmentQuery(input.substructure);
    if (!query.ok)
      throw new AppError("bad_request", query.error, { details: [{ field: "substructure", message: query.error }] });
    const bits = toBitString(query.fingerprint);
    const fp = sql`(${compounds.fingerprint} & ${bits}::bit(1024)) = ${bits}::bit(1024)`;
    // Ranking: text rank first when there is text; then smaller molecules first (closest to the
    // fragment), then the registry number; or the column the user sorted by.
    const order = explicitSort ?? [
      ...(text ? [asc(text.rank)] : []),
      asc(compounds.heavyAtoms),
      asc(compounds.registryNumber),
    ];
    const candidates = await db
      .select({
        id: compounds.id,
        structureKey: compounds.structureKey,
        n: sql<number>`count(*) over ()`.mapWith(Number),
      })
      .from(compounds)
      .where(and(fp, cond))
      .orderBy(...order)
      .limit(MAX_SUBSTRUCTURE_CANDIDATES);
    const candidateTotal = candidates[0]?.n ?? 0;
    // A small candidate set is always checked to the end (an exact total even while openchemlib
    // is still cold in a fresh server process); a large one within the time budget.
    const budget = candidateTotal <= SMALL_CANDIDATE_SET ? SMALL_SET_BUDGET_MS : SUBSTRUCTURE_BUDGET_MS;
    const page = exactSearchPage(query, candidates, {
      offset: input.offset,
      limit: input.limit,
      countAll: true,
      timeBudgetMs: budget,
    });
    const complete = page.complete && candidateTotal <= candidates.length;
    const ids = page.items.map((c) => c.id);
    const rows = ids.length ? await db.select().from(compounds).where(inArray(compounds.id, ids)) : [];
    const byId = new Map(rows.map((r) => [r.id, r]));
    return {
      items: ids.map((id) => decorate(byId.get(id)!, input.thumbnails)),
      total: page.matched,
      totalIsLowerBound: !complete,
      substructure: {
        understoodAs: query.understoodAs,
        candidates: candidateTotal,
        checked: page.checked,
        timedOut: page.timedOut,
      },
    };
  }

  const order =
    explicitSort ??
    (text ? [asc(text.rank), desc(text.similarity), asc(compounds.registryNumber)] : [asc(compounds.registryNumber)]);
  const rows = await db
    .select({
      c: compounds,
      total: sql<number>`count(*) over ()`.mapWith(Number),
      ...(text ? { rank: text.rank } : {}),
    })
    .from(compounds)
    .where(cond)
    .orderBy(...order)
    .limit(input.limit)
    .offset(input.offset);
  let total = rows[0]?.total ?? 0;
  if (rows.length === 0 && input.offset > 0) {
    const [r] = await db
      .select({ n: sql<number>`count(*)::int` })
      .from(compounds)
      .where(cond);
    total = r?.n ?? 0;
  }
  return {
    items: rows.map((r) => ({
      ...decorate(r.c, input.thumbnails),
      ...("rank" in r && r.rank !== undefined ? { rank: RANK_NAMES[Number(r.rank)] } : {}),
    })),
    total,
    totalIsLowerBound: false,
  };
}

function decorate(c: CompoundRow, thumbnails?: boolean) {
  const s = compoundSummary(c);
  if (!thumbnails) return s;
  let svg: string | undefined;
  try {
    svg = structureSvg(c.structureKey, { width: 120, height: 90, idPrefix: "t-" });
  } catch {
    svg = undefined;
  }
  return { ...s, svg };
}

// ---------------------------------------------------------------- libraries

const REGISTRY_ID_TOKEN = /[A-Za-z][A-Za-z0-9]{0,7}-\d+/g;

/** Registry IDs from pasted text (one per line, or separated by commas, spaces or tabs). */
export function parseIdList(text: string): string[] {
  const tokens = text
    .split(/[\s,;]+/)
    .map((t) => t.trim().toUpperCase())
    .filter((t) => t !== "");
  return [...new Set(tokens)];
}

async function resolveIds(tx: Tx, idsText: string): Promise<string[]> {
  const wanted = parseIdList(idsText);
  if (wanted.length === 0) return [];
  if (wanted.length > 10_000) throw new AppError("bad_request", "Paste at most 10,000 registry IDs at a time.");
  const notIds = wanted.filter((t) => !new RegExp(`^${REGISTRY_ID_TOKEN.source}$`).test(t));
  if (notIds.length > 0) {
    throw new AppError(
      "bad_request",
      `Not a registry ID: ${notIds.slice(0, 5).join(", ")}${notIds.length > 5 ? ` and ${notIds.length - 5} more` : ""}. Nothing was added.`,
      {
        details: notIds
          .slice(0, 50)
          .map((t) => ({
            field: "ids",
            message: `"${t.slice(0, 40)}" is not a registry ID (e.g. ${formatRegistryId(1)}).`,
          })),
      },
    );
  }
  const found = await tx
    .select({ id: compounds.id, registryId: compounds.registryId })
    .from(compounds)
    .where(inArray(compounds.registryId, wanted));
  const known = new Map(found.map((f) => [f.registryId, f.id]));
  const missing = wanted.filter((w) => !known.has(w));
  if (missing.length > 0) {
    throw new AppError(
      "bad_request",
      `Not in the registry: ${missing.slice(0, 5).join(", ")}${missing.length > 5 ? ` and ${missing.length - 5} more` : ""}. Nothing was added.`,
      {
        details: missing.slice(0, 50).map((t) => ({ field: "ids", message: `${t} is not registered.` })),
      },
    );
  }
  return wanted.map((w) => known.get(w)!);
}

/** Creates a library, optionally with members from a pasted list of registry IDs (all or none). */
export async function createLibrary(
  actor: Actor,
  input: { name: string; description?: string; ids?: string },
): Promise<{ id: string; added: number }> {
  try {
    return await db.transaction(async (tx) => {
      const [lib] = await tx
        .insert(compoundLibraries)
        .values({ name: input.name, description: input.description ?? null, createdBy: actor.id })
        .returning({ id: compoundLibraries.id });
      const ids = input.ids ? await resolveIds(tx, input.ids) : [];
      for (const part of chunks(ids))
        await tx
          .insert(libraryMembers)
          .values(part.map((compoundId) => ({ libraryId: lib!.id, compoundId, addedBy: actor.id })));
      await audit(tx, actor, {
        action: "library.create",
        entityType: "library",
        entityId: lib!.id,
        after: { name: input.name, members: ids.length },
      });
      return { id: lib!.id, added: ids.length };
    });
  } catch (e) {
    if (isUniqueViolation(e, "compound_libraries_name"))
      throw new AppError("conflict", `A library named "${input.name}" exists already.`);
    throw e;
  }
}

/** Adds compounds to a library from registry IDs; ones already in it are skipped. */
export async function addToLibrary(
  actor: Actor,
  libraryId: string,
  idsText: string,
): Promise<{ added: number; already: number }> {
  return db.transaction(async (tx) => {
    const [lib] = await tx.select().from(compoundLibraries).where(eq(compoundLibraries.id, libraryId));
    if (!lib) throw new AppError("not_found", "No such library.");
    const ids = await resolveIds(tx, idsText);
    if (ids.length === 0)
      throw new AppError("bad_request", "Give at least one registry ID.", {
        details: [{ field: "ids", message: "Give at least one registry ID." }],
      });
    let added = 0;
    for (const part of chunks(ids)) {
      const r = await tx
        .insert(libraryMembers)
        .values(part.map((compoundId) => ({ libraryId, compoundId, addedBy: actor.id })))
        .onConflictDoNothing()
        .returning({ c: libraryMembers.compoundId });
      added += r.length;
    }
    await audit(tx, actor, { action: "library.add", entityType: "library", entityId: libraryId, after: { added } });
    return { added, already: ids.length - added };
  });
}

export async function removeFromLibrary(actor: Actor, libraryId: string, registryId: string): Promise<void> {
  await db.transaction(async (tx) => {
    const c = await compoundByRegistryId(tx, registryId);
    const r = await tx
      .delete(libraryMembers)
      .where(and(eq(libraryMembers.libraryId, libraryId), eq(libraryMembers.compoundId, c.id)))
      .returning({ c: libraryMembers.compoundId });
    if (r.length === 0) throw new AppError("not_found", `${c.registryId} is not in this library.`);
    await audit(tx, actor, {
      action: "library.remove",
      entityType: "library",
      entityId: libraryId,
      before: { registryId: c.registryId },
    });
  });
}

export async function listLibraries() {
  return db
    .select({
      id: compoundLibraries.id,
      name: compoundLibraries.name,
      description: compoundLibraries.description,
      createdAt: compoundLibraries.createdAt,
      createdBy: users.name,
      members: sql<number>`(select count(*)::int from ${libraryMembers} m where m.library_id = ${compoundLibraries.id})`,
    })
    .from(compoundLibraries)
    .leftJoin(users, eq(users.id, compoundLibraries.createdBy))
    .orderBy(asc(compoundLibraries.name));
}

export async function getLibrary(libraryId: string) {
  const [lib] = await db.select().from(compoundLibraries).where(eq(compoundLibraries.id, libraryId));
  if (!lib) throw new AppError("not_found", "No such library.");
  const members = await db
    .select({ c: compounds, addedAt: libraryMembers.addedAt })
    .from(libraryMembers)
    .innerJoin(compounds, eq(compounds.id, libraryMembers.compoundId))
    .where(eq(libraryMembers.libraryId, libraryId))
    .orderBy(asc(compounds.registryNumber));
  return { ...lib, members: members.map((m) => compoundSummary(m.c)) };
}

// ---------------------------------------------------------------- results across campaigns

/**
 * The current analysis results for one compound in every campaign the user may see (members see
 * their campaigns; administrators all). Concentrations in µM. Read-only: results are written by
 * the analyses service.
 */
export async function resultsForCompound(user: Pick<SessionUser, "id" | "globalRole">, registryId: string) {
  const visible =
    user.globalRole === "admin"
      ? sql`true`
      : sql`exists (select 1 from ${memberships} m where m.campaign_id = ${compoundResults.campaignId} and m.user_id = ${user.id})`;
  return db
    .select({
      campaignId: campaigns.id,
      campaign: campaigns.name,
      experimentId: experiments.id,
      experiment: experiments.name,
      kind: compoundResults.kind,
      nPoints: compoundResults.nPoints,
      pctInhibition: compoundResults.pctInhibition,
      hit: compoundResults.hit,
      ic50Um: compoundResults.ic50Um,
      ic50Qualifier: compoundResults.ic50Qualifier,
      hill: compoundResults.hill,
      mechanism: compoundResults.mechanism,
      mechanismLabel: compoundResults.mechanismLabel,
      kiUm: compoundResults.kiUm,
      alpha: compoundResults.alpha,
      flags: compoundResults.flags,
      finishedAt: analyses.finishedAt,
    })
    .from(compoundResults)
    .innerJoin(analyses, and(eq(analyses.id, compoundResults.analysisId), eq(analyses.isCurrent, true)))
    .innerJoin(campaigns, eq(campaigns.id, compoundResults.campaignId))
    .innerJoin(experiments, eq(experiments.id, compoundResults.experimentId))
    .where(and(eq(compoundResults.compoundId, registryId), visible))
    .orderBy(asc(campaigns.name), asc(experiments.name));
}
export type CompoundResultRow = Awaited<ReturnType<typeof resultsForCompound>>[number];
