import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { listPlateMaps } from "@/server/services/plates";
import { ChemicalSafetyNote } from "@/components/ui/caution";
import { RunUpload } from "../_components/run-upload";

export const metadata = { title: "Upload reader exports" };

export default async function UploadPage({
  params,
  searchParams,
}: {
  params: Promise<{ campaignId: string }>;
  searchParams: Promise<{ map?: string }>;
}) {
  const { campaignId } = await params;
  const { map } = await searchParams;
  await pageCampaign(campaignId, "plate:write");
  const maps = await listPlateMaps(campaignId);
  const base = `/campaigns/${campaignId}/plates`;
  return (
    <div className="flex max-w-5xl flex-col gap-4">
      <div>
        <p className="text-xs text-ink-muted">
          <Link href={base}>Plates</Link> / upload
        </p>
        <h1>Upload reader exports</h1>
        <p className="max-w-prose text-sm text-ink-muted">
          CSV, TSV or XLSX, up to 25 MB per file: a long table (<code>well,value</code> or{" "}
          <code>well,time_s,value</code>) or plate grids (column numbers across, row letters down; one grid per read
          with its time in seconds above it). Each file is checked first; nothing is stored until you upload it. Stored
          files are kept with their SHA-256, and the same file is never stored twice.
        </p>
      </div>
      <ChemicalSafetyNote />
      {maps.length === 0 ? (
        <p className="text-sm text-ink-muted">
          There is no plate map in this campaign yet. <Link href={`${base}/maps/new`}>Create one</Link> first.
        </p>
      ) : (
        <RunUpload
          campaignId={campaignId}
          maps={maps
            .filter((m) => !m.isTemplate || m.runs > 0)
            .concat(maps.filter((m) => m.isTemplate && m.runs === 0))
            .map((m) => ({ id: m.id, name: m.name, format: m.format, isTemplate: m.isTemplate }))}
          initialMapId={maps.some((m) => m.id === map) ? map! : undefined}
        />
      )}
    </div>
  );
}
