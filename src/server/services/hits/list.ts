import "server-only";
import { eq, getTableColumns, inArray, sql, type SQL, type SQLWrapper } from "drizzle-orm";
import { db } from "@/server/db/client";
import { hitRows, hitRowVersions } from "@/server/db/schema";
import { containsPattern } from "@/server/db/sql-helpers";
import type { HitItem } from "@/lib/hits/item";
import { rangeFields, type HitFilter, type SortField } from "@/lib/hits/query";

export { HIT_UNITS } from "@/lib/hits/query";

export type { HitItem };

const sortColumn: Record<Exclude<SortField, "default">, SQLWrapper> = {
  registryId: hitRows.compoundId,
  mechanism: hitRows.mechanism,
  ki: hitRows.kiUm,
  kic: hitRows.kicUm,
  kiu: hitRows.kiuUm,
  alpha: hitRows.alpha,
  ic50: hitRows.ic50Um,
  hill: hitRows.hill,
  pctInhibition: hitRows.pctInhibition,
  le: hitRows.le,
  lipe: hitRows.lipe,
  mw: hitRows.mwGPerMol,
  clogp: hitRows.clogp,
  heavyAtoms: hitRows.heavyAtoms,
  flags: hitRows.flagged,
  status: hitRows.status,
  owner: hitRows.ownerName,
  lastTested: hitRows.lastTestedAt,
  comments: hitRows.commentCount,
};

/** The filter of the grid, the API and the export, as one WHERE clause. */
export function whereOf(campaignId: string, f: HitFilter): SQL {
  const parts: SQL[] = [sql`${hitRows.campaignId} = ${campaignId}`];
  if (f.status?.length) parts.push(inArray(hitRows.status, f.status));
  if (f.mechanism?.length) {
    const ors: SQL[] = [];
    const models = f.mechanism.filter((m) => m !== "ambiguous" && m !== "none");
    if (models.length) ors.push(inArray(hitRows.mechanism, models));
    if (f.mechanism.includes("ambiguous")) ors.push(sql`${hitRows.mechanismLabel} = 'ambiguous'`);
    if (f.mechanism.includes("none")) ors.push(sql`${hitRows.mechanism} is null`);
    parts.push(sql`(${sql.join(ors, sql` or `)})`);
  }
  if (f.flagged !== undefined) parts.push(eq(hitRows.flagged, f.flagged));
  if (f.hit !== undefined) parts.push(eq(hitRows.hit, f.hit));
  if (f.q)
    parts.push(
      sql`(${hitRows.compoundId} ilike ${containsPattern(f.q)} or ${hitRows.name} ilike ${containsPattern(f.q)})`,
    );
  if (f.owner) parts.push(sql`${hitRows.ownerName} ilike ${containsPattern(f.owner)}`);
  if (f.lastTestedFrom) parts.push(sql`${hitRows.lastTestedAt} >= ${f.lastTestedFrom.toISOString()}`);
  if (f.lastTestedTo)
    parts.push(sql`${hitRows.lastTestedAt} < ${new Date(f.lastTestedTo.getTime() + 86_400_000).toISOString()}`);
  for (const field of rangeFields) {
    const col = sortColumn[field];
    const min = f[`${field}Min`];
    const max = f[`${field}Max`];
    if (min !== undefined) parts.push(sql`${col} >= ${min}`);
    if (max !== undefined) parts.push(sql`${col} <= ${max}`);
  }
  return sql.join(parts, sql` and `);
}

/** The ranked order (clean rows first, then Ki, IC50, % inhibition) or one column, blanks last. */
export function orderOf(f: HitFilter): SQL {
  if (f.sort === "default") {
    return sql`${hitRows.flagged} asc, ${hitRows.kiUm} asc nulls last, ${hitRows.ic50Um} asc nulls last, ${hitRows.pctInhibition} desc nulls last, ${hitRows.compoundId} asc`;
  }
  const col = sortColumn[f.sort];
  return f.dir === "desc"
    ? sql`${col} desc nulls last, ${hitRows.compoundId} desc`
    : sql`${col} asc nulls last, ${hitRows.compoundId} asc`;
}

/** Every column but the stored API item (which only the page query reads). */
const { itemJson: _itemJson, ...columns } = getTableColumns(hitRows);
export const rowColumns = columns;
export type HitRow = Omit<typeof hitRows.$inferSelect, "itemJson">;

/** One row as the API, the grid and the export see it (concentrations µM). */
export function hitJson(r: HitRow): HitItem {
  return {
    registryId: r.compoundId,
    name: r.name,
    mechanism: r.mechanism,
    mechanismLabel: r.mechanismLabel,
    ki: r.kiUm,
    kiCi95: [r.kiLoUm, r.kiHiUm],
    kic: r.kicUm,
    kiu: r.kiuUm,
    alpha: r.alpha,
    ic50: r.ic50Um,
    ic50Qualifier: r.ic50Qualifier,
    ic50Ci95: [r.ic50LoUm, r.ic50HiUm],
    hill: r.hill,
    pctInhibition: r.pctInhibition,
    hit: r.hit,
    pKi: r.pKi,
    le: r.le,
    lipe: r.lipe,
    mw: r.mwGPerMol,
    clogp: r.clogp,
    heavyAtoms: r.heavyAtoms,
    flags: r.flags,
    flagged: r.flagged,
    status: r.status,
    owner: r.ownerName,
    statusChangedAt: r.statusChangedAt?.toISOString() ?? null,
    lastTested: r.lastTestedAt?.toISOString() ?? null,
    comments: r.commentCount,
  };
}

// Totals of recent filters, per campaign version (hit_row_versions): counting up to 100,000
// rows on every page was most of a request's cost (bench/hits.ts). The version is read before
// the count, so a total is never kept under a version older than the rows it counted. The map
// holds the count's promise, so requests asking at the same moment (a grid opening for twenty
// people) share one count.
const totals = new Map<string, Promise<number>>();
const TOTALS_MAX = 5000;
const NOT_IN_KEY = new Set(["sort", "dir", "limit", "offset"]);

function filterKey(campaignId: string, version: number, f: HitFilter): string {
  // Order and paging do not change a count; every other set filter is part of the key.
  const parts = Object.entries(f)
    .filter(([k, v]) => v !== undefined && !NOT_IN_KEY.has(k))
    .sort(([a], [b]) => a.localeCompare(b))
    .map(
      ([k, v]) =>
        `${k}=${v instanceof Date ? v.toISOString() : Array.isArray(v) ? [...v].sort().join(",") : String(v)}`,
    );
  return `${campaignId}|${version}|${parts.join("&")}`;
}

/** A sorted, filtered page of the campaign's hit rows as JSON text (`[…]`), and how many rows match. */
export async function listHitsJson(
  campaignId: string,
  f: HitFilter,
  limit: number,
  offset: number,
): Promise<{ itemsJson: string; total: number }> {
  const where = whereOf(campaignId, f);
  // One statement (one round trip) for the page and the version its total is cached under. Each
  // row's item is stored JSON text (hit_rows.item_json, kept by a trigger): a page is 100 strings
  // joined. string_agg takes the rows in the order the sorted, limited subquery gives them (no
  // join or grouping in between to reorder them); a window or an ORDER BY inside the aggregate
  // to say so again doubled the statement's cost (measured with pgbench). The integration tests
  // compare the API's order with the export's.
  const [page] = await db.execute<{ items: string; version: number | null }>(sql`
    select (select ${hitRowVersions.version} from ${hitRowVersions} where ${hitRowVersions.campaignId} = ${campaignId}) as version,
           coalesce((select '[' || string_agg(p.item_json, ',') || ']'
                     from (select ${hitRows.itemJson} from ${hitRows} where ${where} order by ${orderOf(f)} limit ${limit} offset ${offset}) p), '[]') as items`);
  const key = filterKey(campaignId, Number(page?.version ?? 0), f);
  let total = totals.get(key);
  if (!total) {
    total = db
      .select({ n: sql<number>`count(*)::int` })
      .from(hitRows)
      .where(where)
      .then(([c]) => c?.n ?? 0);
    if (totals.size >= TOTALS_MAX) totals.delete(totals.keys().next().value!);
    totals.set(key, total);
    const counted = total;
    counted.catch(() => totals.get(key) === counted && totals.delete(key)); // a failed count is not kept
  }
  return { itemsJson: page?.items ?? "[]", total: await total };
}

/** The same page as objects. */
export async function listHits(
  campaignId: string,
  f: HitFilter,
  limit: number,
  offset: number,
): Promise<{ items: HitItem[]; total: number }> {
  const r = await listHitsJson(campaignId, f, limit, offset);
  return { items: JSON.parse(r.itemsJson) as HitItem[], total: r.total };
}
