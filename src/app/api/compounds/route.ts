import { requireCapabilityAnywhere } from "@/server/auth/guard";
import { requireRegistryReader } from "@/server/auth/compound-access";
import { json, parseJson, parseQuery, route } from "@/server/http";
import { PROPERTY_UNITS, registerCompound, searchCompounds } from "@/server/services/compounds";
import { registerBody, searchQuery } from "./schema";
import { publicProperties } from "@/lib/chem/properties";

export const dynamic = "force-dynamic";

/**
 * Search the registry (anyone signed in, over the compounds they may read: the whole registry
 * for chemists and admins, otherwise those of their campaigns; src/server/auth/compound-access.ts): `q` by registry ID, name or alias (ranked), and/or
 * `substructure` (SMILES or SMARTS). `{ items, total, totalIsLowerBound }`; a substructure search
 * that could not check every candidate within its time budget gives a lower bound ("more than").
 */
export const GET = route(async (req) => {
  const scope = await requireRegistryReader();
  const q = parseQuery(req, searchQuery);
  const r = await searchCompounds(scope, {
    q: q.q,
    substructure: q.substructure,
    limit: q.limit,
    offset: q.offset,
    sort: q.sort,
    dir: q.dir,
    libraryId: q.library,
    mwMin: q.mwMin,
    mwMax: q.mwMax,
    thumbnails: q.thumbnails === "1",
  });
  return json({ ...r, limit: q.limit, offset: q.offset, units: PROPERTY_UNITS });
});

/**
 * Register a compound (chemists of any campaign, admins). 201 with the registry ID and computed
 * properties; 409 `{ registryId }` for a structure that is registered already; 400 naming the
 * problem for a structure that cannot be read.
 */
export const POST = route(async (req) => {
  const user = await requireCapabilityAnywhere("compound:write");
  const body = await parseJson(req, registerBody);
  const r = await registerCompound(user, body);
  return json(
    {
      id: r.id,
      registryId: r.registryId,
      ...publicProperties(r.properties),
      batchNumber: r.batchNumber,
      warnings: r.warnings,
      units: PROPERTY_UNITS,
    },
    201,
  );
});
