import { pageCampaign } from "@/server/auth/page-guard";
import { can } from "@/lib/roles";
import { HitsWorkspace } from "./_components/hits-workspace";

export const metadata = { title: "Hits" };

export default async function HitsPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { user, role } = await pageCampaign(campaignId);
  const canTriage = can(user.globalRole, role, "triage:write");
  return (
    <div className="flex flex-col gap-3">
      <div>
        <h1>Hits</h1>
        <p className="max-w-4xl text-sm text-ink-muted">
          One row per compound with a current result. Click a row for its structure, curves, mechanism plots, batches,
          status history and comments.{" "}
          {canTriage
            ? "Select rows to set their triage status together."
            : "Only the project lead (or an administrator) changes triage status."}{" "}
          Research use only: flagged fits stay visible and are ranked after clean ones; a qualified scientist reviews
          every call before a decision.
        </p>
      </div>
      <HitsWorkspace
        campaignId={campaignId}
        canTriage={canTriage}
        canComment={can(user.globalRole, role, "campaign:comment")}
      />
    </div>
  );
}
