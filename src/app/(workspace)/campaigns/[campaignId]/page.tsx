import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Overview" };

function Stat({ label, value, unit }: { label: string; value: string; unit?: string }) {
  return (
    <div className="card px-3 py-2">
      <p className="text-2xs uppercase tracking-wide text-ink-muted">{label}</p>
      <p className="num text-xl font-semibold text-ink">
        {value}
        {unit ? <span className="ml-1 text-xs font-normal text-ink-muted">{unit}</span> : null}
      </p>
    </div>
  );
}

export default async function OverviewPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { campaign } = await pageCampaign(campaignId);
  const km = campaign.kmValue != null ? `${campaign.kmValue} ${campaign.kmUnit ?? ""}` : "not set";
  const e = campaign.enzymeConcValue != null ? `${campaign.enzymeConcValue} ${campaign.enzymeConcUnit ?? ""}` : "not set";
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Overview</h1>
        <p className="text-sm text-ink-muted">
          Substrate {campaign.substrate ?? "not set"} · Km {km} · [E] {e} · QC: Z′ ≥ <span className="num">{campaign.qcMinZPrime}</span>, control CV ≤{" "}
          <span className="num">{campaign.qcMaxCvPct}</span> %
        </p>
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        <Stat label="Plate runs this week" value="0" unit="runs" />
        <Stat label="QC pass rate" value="—" unit="%" />
        <Stat label="Median Z′ (7 days)" value="—" />
        <Stat label="New hits" value="0" unit="compounds" />
        <Stat label="New Ki values" value="0" unit="compounds" />
      </div>
      <EmptyState title="No plate runs in this campaign yet.">
        The Z′ trend, new hits and Ki values, and the team&rsquo;s recent triage decisions appear here once plate runs are uploaded and analysed.
      </EmptyState>
      {campaign.assayNotes ? (
        <section>
          <h3 className="mb-1">Assay notes</h3>
          <p className="max-w-prose whitespace-pre-line text-sm text-ink-soft">{campaign.assayNotes}</p>
        </section>
      ) : null}
    </div>
  );
}
