import "server-only";
import { and, asc, desc, inArray, sql, type SQL } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compounds, libraryMembers } from "@/server/db/schema";
import { containsPattern, escapeLike } from "@/server/db/sql-helpers";
import { AppError } from "@/server/errors";
import { formatRegistryId } from "@/server/registry-id";
import { visibleCompoundSql, type CompoundScope } from "@/server/auth/compound-access";
import { compoundSummary, type CompoundRow, type CompoundSummary } from "./read";
import { structureSvgs } from "./drawings";
import { runChem } from "./prepare-pool";

/** Columns the compound grid may sort by (ties broken by the registry number). */
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
  // "0" is no registry number (numbers start at 1): nothing to match exactly.
  const asNumber = /^\d{1,9}$/.test(text) && Number(text) >= 1 ? formatRegistryId(Number(text)) : null;
  const prefix = `${escapeLike(upper)}%`;
  const contains = containsPattern(lower);
  const lowerPrefix = `${escapeLike(lower)}%`;
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

/** Hard stop for the exact check in the worker, beyond its own time budget (a hostile query). */
const SEARCH_LIMIT_MS = 5_000;

type QueryParsed = { ok: true; understoodAs: string; bits: string } | { ok: false; error: string };
type ExactPage = {
  ok: true;
  ids: string[];
  matched: number;
  checked: number;
  complete: boolean;
  timedOut: boolean;
};

/**
 * The compound grid's search: text, substructure, library and MW filters, ranked and paged, over
 * the compounds the reader may see (compound-access.ts). The substructure query is parsed and
 * matched in the chemistry worker pool, bounded by its time budget and a hard limit.
 */
export async function searchCompounds(scope: CompoundScope, input: SearchInput): Promise<SearchResult> {
  const where = filters(input);
  if (!scope.all) where.push(visibleCompoundSql(scope, compounds.registryId));
  const text = input.q && input.q.trim() !== "" ? textQuery(input.q) : null;
  if (text) where.push(text.where);
  const dir = input.dir === "desc" ? desc : asc;
  const explicitSort = input.sort ? [dir(SORT_FIELDS[input.sort]), asc(compounds.registryNumber)] : null;
  const cond = where.length ? and(...where) : undefined;

  if (input.substructure && input.substructure.trim() !== "") {
    const query = await runChem<QueryParsed>(
      { kind: "query", text: input.substructure },
      "Reading this substructure query",
      SEARCH_LIMIT_MS,
    );
    if (!query.ok)
      throw new AppError("bad_request", query.error, { details: [{ field: "substructure", message: query.error }] });
    const bits = query.bits;
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
    const found = await runChem<ExactPage | { ok: false; error: string }>(
      {
        kind: "search",
        text: input.substructure,
        candidates: candidates.map((c) => ({ id: c.id, structureKey: c.structureKey })),
        options: { offset: input.offset, limit: input.limit, countAll: true, timeBudgetMs: budget },
      },
      "Checking this substructure query",
      budget + SEARCH_LIMIT_MS,
    );
    if (!found.ok)
      throw new AppError("bad_request", found.error, { details: [{ field: "substructure", message: found.error }] });
    const page = { ...found, items: found.ids.map((id) => ({ id })) };
    const complete = page.complete && candidateTotal <= candidates.length;
    const ids = page.items.map((c) => c.id);
    const rows = ids.length ? await db.select().from(compounds).where(inArray(compounds.id, ids)) : [];
    const byId = new Map(rows.map((r) => [r.id, r]));
    return {
      items: await decorate(
        ids.map((id) => byId.get(id)!),
        input.thumbnails,
      ),
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
  const decorated = await decorate(
    rows.map((r) => r.c),
    input.thumbnails,
  );
  return {
    items: rows.map((r, i) => ({
      ...decorated[i]!,
      ...("rank" in r && r.rank !== undefined ? { rank: RANK_NAMES[Number(r.rank)] } : {}),
    })),
    total,
    totalIsLowerBound: false,
  };
}

/** Summaries, with thumbnails drawn in the worker pool (cached) when asked for. */
async function decorate(cs: CompoundRow[], thumbnails?: boolean): Promise<(CompoundSummary & { svg?: string })[]> {
  const summaries = cs.map(compoundSummary);
  if (!thumbnails || cs.length === 0) return summaries;
  const svgs = await structureSvgs(
    cs.map((c) => c.structureKey),
    { width: 120, height: 90, idPrefix: "t-" },
  );
  return summaries.map((s, i) => ({ ...s, svg: svgs[i] ?? undefined }));
}
