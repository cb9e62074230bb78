import "server-only";
import { visibleCompoundSql, type CompoundScope } from "@/server/auth/compound-access";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { db, type Tx } from "@/server/db/client";
import { compoundLibraries, compounds, libraryMembers, users } from "@/server/db/schema";
import { isUniqueViolation } from "@/server/db/sql-helpers";
import { AppError } from "@/server/errors";
import type { Actor } from "@/server/auth/actor";
import { formatRegistryId } from "@/server/registry-id";
import { looksLikeRegistryId } from "@/lib/registry-id";
import { audit } from "../audit";
import { compoundByRegistryId, compoundSummary } from "./read";
import { chunks } from "./write";

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
  const notIds = wanted.filter((t) => !looksLikeRegistryId(t));
  if (notIds.length > 0) {
    throw new AppError(
      "bad_request",
      `Not a registry ID: ${notIds.slice(0, 5).join(", ")}${notIds.length > 5 ? ` and ${notIds.length - 5} more` : ""}. Nothing was added.`,
      {
        details: notIds.slice(0, 50).map((t) => ({
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

/** Takes one compound out of a library (404 when it is not in it). */
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

/** Every library with the count of its members the reader may see, by name. */
export async function listLibraries(scope: CompoundScope) {
  return db
    .select({
      id: compoundLibraries.id,
      name: compoundLibraries.name,
      description: compoundLibraries.description,
      createdAt: compoundLibraries.createdAt,
      createdBy: users.name,
      members: sql<number>`(select count(*)::int from ${libraryMembers} m join ${compounds} c on c.id = m.compound_id where m.library_id = ${compoundLibraries.id} and ${visibleCompoundSql(scope, sql`c.registry_id`)})`,
    })
    .from(compoundLibraries)
    .leftJoin(users, eq(users.id, compoundLibraries.createdBy))
    .orderBy(asc(compoundLibraries.name));
}

/** One library with the members the reader may see (compound-access.ts), in registry order. */
export async function getLibrary(scope: CompoundScope, libraryId: string) {
  const [lib] = await db.select().from(compoundLibraries).where(eq(compoundLibraries.id, libraryId));
  if (!lib) throw new AppError("not_found", "No such library.");
  const members = await db
    .select({ c: compounds, addedAt: libraryMembers.addedAt })
    .from(libraryMembers)
    .innerJoin(compounds, eq(compounds.id, libraryMembers.compoundId))
    .where(and(eq(libraryMembers.libraryId, libraryId), visibleCompoundSql(scope, compounds.registryId)))
    .orderBy(asc(compounds.registryNumber));
  return { ...lib, members: members.map((m) => compoundSummary(m.c)) };
}
