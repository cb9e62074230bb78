import "server-only";
import { eq, sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";
import { db } from "@/server/db/client";
import { memberships } from "@/server/db/schema";
import { AppError } from "@/server/errors";
import { can } from "@/lib/roles";
import type { SessionUser } from "./session";
import { requireCapabilityAnywhere, requireUser } from "./guard";
import { routeScope } from "./route-scope";

/**
 * The one owner of who may read which compounds of the registry (structures, molfiles, batches,
 * stocks, libraries' members, drawings).
 *
 * - A registry role — administrator, or chemist in any campaign — reads the whole registry.
 * - Anyone else reads only the compounds that appear in a campaign they belong to: on one of its
 *   plate maps, in its analysis results or on its hit list. A partner-lab viewer of one campaign
 *   so sees that campaign's compounds and nothing else.
 *
 * A compound outside the reader's scope is "not found" (404), never "forbidden", so its
 * existence is not confirmed. Every registry read builds its SQL with `visibleCompoundSql`.
 */
export type RegistryReader = Pick<SessionUser, "id" | "globalRole">;

/** `campaignIds`: a personal API token limited to these campaigns reads only through them. */
export type CompoundScope = { user: RegistryReader; all: boolean; campaignIds?: string[] | null };

/** Admin, or chemist in at least one campaign (of `onlyIn`, when a token limits the campaigns). */
export async function hasRegistryRole(user: RegistryReader, onlyIn: string[] | null = null): Promise<boolean> {
  if (user.globalRole === "admin") return true;
  const roles = await db
    .select({ role: memberships.role, campaignId: memberships.campaignId })
    .from(memberships)
    .where(eq(memberships.userId, user.id));
  return roles.some((r) => can("member", r.role, "compound:write") && (!onlyIn || onlyIn.includes(r.campaignId)));
}

/** The signed-in user and what of the registry they may read (401 when signed out). */
export async function requireRegistryReader(): Promise<CompoundScope> {
  const user = await requireUser();
  return compoundScope(user);
}

export async function compoundScope(user: RegistryReader): Promise<CompoundScope> {
  const campaignIds = routeScope()?.grant?.campaignIds ?? null;
  return { user, all: await hasRegistryRole(user, campaignIds), campaignIds };
}

/**
 * SQL: the registry ID `registryId` (a column or expression holding a registry ID) is readable in
 * this scope. For a full scope it is `true`; otherwise membership in a campaign whose plate maps,
 * results or hit list name the compound. Plate maps hold registry IDs exactly (validated on
 * upload), results and hit rows the registry ID as `compound_id`.
 */
export function visibleCompoundSql(scope: CompoundScope, registryId: AnyPgColumn | SQL): SQL {
  if (scope.all) return sql`true`;
  const u = scope.user.id;
  const only = scope.campaignIds?.length
    ? sql` and m.campaign_id in (${sql.join(
        scope.campaignIds.map((id) => sql`${id}::uuid`),
        sql`, `,
      )})`
    : sql``;
  return sql`${registryId} in (
    select h.compound_id from hit_rows h join memberships m on m.campaign_id = h.campaign_id and m.user_id = ${u}${only}
    union
    select r.compound_id from compound_results r join memberships m on m.campaign_id = r.campaign_id and m.user_id = ${u}${only}
    union
    select w.value->>'compound' from plate_maps pm join memberships m on m.campaign_id = pm.campaign_id and m.user_id = ${u}${only}
      cross join lateral jsonb_array_elements(pm.wells) w
  )`;
}

/** 404 for a compound outside the scope (the same sentence as for one that does not exist). */
export function compoundNotFound(registryId: string): AppError {
  return new AppError("not_found", `No compound ${registryId.slice(0, 40)} in the registry.`);
}

/**
 * For pages only: whether to show the write controls of the compound registry. The actions and
 * routes check again on the server (requireCapabilityAnywhere); this only hides buttons.
 */
export async function canWriteCompounds(_user: SessionUser): Promise<boolean> {
  try {
    await requireCapabilityAnywhere("compound:write");
    return true;
  } catch (e) {
    if (e instanceof AppError && (e.code === "forbidden" || e.code === "unauthorized")) return false;
    throw e;
  }
}
