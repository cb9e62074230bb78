import { pageCampaign } from "@/server/auth/page-guard";
import { roleLabels } from "@/lib/roles";
import { CampaignNav } from "../../_components/campaign-nav";
import { ResearchUseNote } from "@/components/ui/caution";

export default async function CampaignLayout({
  children,
  params,
}: {
  children: React.ReactNode;
  params: Promise<{ campaignId: string }>;
}) {
  const { campaignId } = await params;
  const { campaign, role, user } = await pageCampaign(campaignId);
  return (
    <div className="flex flex-1">
      <aside className="w-52 shrink-0 border-r border-rule bg-paper-sunk px-3 py-4">
        <p className="truncate text-sm font-semibold text-ink" title={campaign.name}>
          {campaign.name}
        </p>
        <p className="mb-1 truncate text-xs text-ink-muted" title={campaign.targetEnzyme}>
          {campaign.targetEnzyme}
        </p>
        <p className="mb-4 text-2xs text-ink-faint">
          {role ? `You: ${roleLabels[role]}` : user.globalRole === "admin" ? "You: administrator" : ""}
        </p>
        <CampaignNav campaignId={campaign.id} />
      </aside>
      <main className="min-w-0 flex-1 px-6 py-5">
        {children}
        <ResearchUseNote className="mt-10 border-t border-rule pt-3" />
      </main>
    </div>
  );
}
