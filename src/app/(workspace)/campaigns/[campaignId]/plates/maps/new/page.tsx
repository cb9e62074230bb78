import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { listPlateMaps, getPlateMap } from "@/server/services/plates";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { PlateMapEditor } from "../../_components/plate-map-editor";

export const metadata = { title: "New plate map" };

export default async function NewPlateMapPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  await pageCampaign(campaignId, "plate:write");
  const maps = await listPlateMaps(campaignId);
  const templates = await Promise.all(maps.filter((m) => m.isTemplate).map((m) => getPlateMap(campaignId, m.id)));
  return (
    <div className="flex flex-col gap-4">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={`/campaigns/${campaignId}/plates`}>Plates</Link> / new plate map
        </p>
        <h1>New plate map</h1>
      </div>
      <ChemicalSafetyNote />
      <PlateMapEditor
        campaignId={campaignId}
        initial={{ name: "", format: 384, wells: [], isTemplate: false, signalDirection: "falls" }}
        templates={templates.map((t) => ({ id: t.id, name: t.name, format: t.format, wells: t.wells }))}
        canWrite
        locked={false}
      />
    </div>
  );
}
