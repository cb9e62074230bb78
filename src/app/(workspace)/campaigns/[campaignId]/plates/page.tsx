import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Plates" };

export default async function PlatesPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  await pageCampaign(campaignId);
  return (
    <div className="flex flex-col gap-4">
      <h1>Plates</h1>
      <EmptyState title="No plate maps or plate runs yet.">Plate maps describe what is in each well (96, 384 or 1536). Reader exports uploaded against a plate map are stored, checksummed, parsed and checked (Z′, S/B, control CV) before their numbers count.</EmptyState>
    </div>
  );
}
