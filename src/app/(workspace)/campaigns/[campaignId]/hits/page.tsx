import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Hits" };

export default async function HitsPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  await pageCampaign(campaignId);
  return (
    <div className="flex flex-col gap-4">
      <h1>Hits</h1>
      <EmptyState title="No ranked hits yet.">Compounds with results appear here ranked by Ki (nM), with IC50, Hill slope, ligand efficiency and flags, for the project lead to triage.</EmptyState>
    </div>
  );
}
