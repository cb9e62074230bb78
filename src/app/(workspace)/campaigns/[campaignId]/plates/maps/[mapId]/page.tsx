import Link from "next/link";
import { notFound } from "next/navigation";
import { pageCampaign } from "@/server/auth/page-guard";
import { getPlateMap, listPlateMaps } from "@/server/services/plates";
import { AppError } from "@/server/errors";
import { can } from "@/lib/roles";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { PlateMapEditor } from "../../_components/plate-map-editor";

export const metadata = { title: "Plate map" };

export default async function PlateMapPage({ params }: { params: Promise<{ campaignId: string; mapId: string }> }) {
  const { campaignId, mapId } = await params;
  const { user, role } = await pageCampaign(campaignId);
  if (!/^[0-9a-f-]{36}$/i.test(mapId)) notFound();
  const m = await getPlateMap(campaignId, mapId).catch((e: unknown) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const all = await listPlateMaps(campaignId);
  const runs = all.find((x) => x.id === mapId)?.runs ?? 0;
  const writer = can(user.globalRole, role, "plate:write");
  const templates = writer
    ? await Promise.all(all.filter((x) => x.isTemplate && x.id !== mapId).map((x) => getPlateMap(campaignId, x.id)))
    : [];
  const base = `/campaigns/${campaignId}/plates`;
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-2">
        <div>
          <p className="text-xs text-ink-muted">
            <Link href={base}>Plates</Link> / plate map
          </p>
          <h1>{m.name}</h1>
          <p className="text-sm text-ink-muted">
            {m.format}-well · {m.sampleWells} samples, {m.neutralWells} neutral and {m.fullWells} full-inhibition
            controls · signal {m.signalDirection} with inhibition · {runs} runs
            {m.isTemplate ? " · template" : ""}
          </p>
        </div>
        {writer ? (
          <Link className="btn-primary" href={`${base}/upload?map=${m.id}`}>
            Upload exports for this map
          </Link>
        ) : null}
      </div>
      {writer ? <ChemicalSafetyNote /> : null}
      <PlateMapEditor
        key={m.updatedAt.toISOString()}
        campaignId={campaignId}
        mapId={m.id}
        initial={{
          name: m.name,
          format: m.format,
          wells: m.wells,
          isTemplate: m.isTemplate,
          signalDirection: m.signalDirection,
        }}
        templates={templates.map((t) => ({ id: t.id, name: t.name, format: t.format, wells: t.wells }))}
        canWrite={writer}
        locked={runs > 0}
      />
    </div>
  );
}
