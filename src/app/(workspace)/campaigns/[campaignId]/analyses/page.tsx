import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Analyses" };

export default async function AnalysesPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  await pageCampaign(campaignId);
  return (
    <div className="flex flex-col gap-4">
      <h1>Analyses</h1>
      <EmptyState title="No experiments analysed yet.">Single-dose screens give % inhibition and hit calls, dose-response plates give IC50 with 95 % CI, and mechanism studies give the mechanism with Ki (and α for mixed inhibitors).</EmptyState>
    </div>
  );
}
