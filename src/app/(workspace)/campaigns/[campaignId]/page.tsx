import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { EmptyState } from "@/components/ui/empty-state";
import { ZPrimeTrend } from "@/components/plots/z-prime-trend";
import { campaignOverview } from "@/server/services/overview";
import { StatusChip } from "./hits/_components/status";

export const metadata = { title: "Overview" };
export const dynamic = "force-dynamic";

function Stat({ label, value, unit, note }: { label: string; value: string; unit?: string; note?: string }) {
  return (
    <div className="card px-3 py-2">
      <p className="text-2xs uppercase tracking-wide text-ink-muted">{label}</p>
      <p className="num text-xl font-semibold text-ink">
        {value}
        {unit ? <span className="ml-1 text-xs font-normal text-ink-muted">{unit}</span> : null}
      </p>
      {note ? <p className="text-2xs text-ink-faint">{note}</p> : null}
    </div>
  );
}

const when = (iso: string) =>
  new Date(iso).toLocaleString("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" }) + " UTC";

export default async function OverviewPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { campaign } = await pageCampaign(campaignId);
  const o = await campaignOverview(campaignId);
  const km = campaign.kmValue != null ? `${campaign.kmValue} ${campaign.kmUnit ?? ""}` : "not set";
  const e =
    campaign.enzymeConcValue != null ? `${campaign.enzymeConcValue} ${campaign.enzymeConcUnit ?? ""}` : "not set";
  const base = `/campaigns/${campaignId}`;
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Overview</h1>
        <p className="text-sm text-ink-muted">
          Substrate {campaign.substrate ?? "not set"} · Km {km} · [E] {e} · QC: Z′ ≥{" "}
          <span className="num">{campaign.qcMinZPrime}</span>, control CV ≤{" "}
          <span className="num">{campaign.qcMaxCvPct}</span> %
        </p>
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5" data-testid="overview-stats">
        <Stat label="Plate runs this week" value={String(o.week.runs)} unit="runs" note={`${o.totals.runs} in all`} />
        <Stat
          label="QC pass rate (7 days)"
          value={o.week.passRatePct === null ? "—" : o.week.passRatePct.toFixed(0)}
          unit="%"
          note={o.week.runs ? `of ${o.week.runs} runs` : "no runs this week"}
        />
        <Stat
          label="Median Z′ (7 days)"
          value={o.week.medianZPrime === null ? "—" : o.week.medianZPrime.toFixed(2)}
          unit="dimensionless"
        />
        <Stat label="New hits (7 days)" value={String(o.week.newHits)} unit="compounds" note="single-dose hit calls" />
        <Stat
          label="New Ki values (7 days)"
          value={String(o.week.newKi)}
          unit="compounds"
          note="from mechanism studies"
        />
      </div>
      {o.totals.runs === 0 ? (
        <EmptyState title="No plate runs in this campaign yet.">
          The Z′ trend, new hits and Ki values, and the team&rsquo;s recent triage decisions appear here once plate runs
          are uploaded and analysed.
        </EmptyState>
      ) : (
        <section className="card px-3 py-2">
          <h3 className="mb-1">Z′ over time</h3>
          <ZPrimeTrend points={o.trend} minZPrime={campaign.qcMinZPrime} runHref={`${base}/plates/runs`} />
        </section>
      )}
      <div className="grid gap-4 lg:grid-cols-2">
        <section>
          <h3 className="mb-2">Recent triage decisions</h3>
          {o.decisions.length === 0 ? (
            <p className="text-sm text-ink-muted">
              No decisions yet.{" "}
              {o.totals.hitRows > 0 ? (
                <Link href={`${base}/hits`}>
                  Open the ranked hits ({o.totals.hitRows} compounds, {o.totals.flagged} flagged).
                </Link>
              ) : null}
            </p>
          ) : (
            <ul className="card divide-y divide-rule" data-testid="recent-decisions">
              {o.decisions.map((d) => (
                <li key={d.id} className="px-3 py-2 text-sm">
                  <p className="flex flex-wrap items-center gap-1.5">
                    <span className="font-mono">{d.compoundId}</span> <StatusChip status={d.from} /> →{" "}
                    <StatusChip status={d.to} />
                    <span className="ml-auto text-2xs text-ink-muted">
                      {d.by ?? "a removed user"} · {when(d.at)}
                    </span>
                  </p>
                  {d.comment ? <p className="text-xs text-ink-soft">{d.comment}</p> : null}
                </li>
              ))}
            </ul>
          )}
        </section>
        <section>
          <h3 className="mb-2">Recent activity</h3>
          {o.activity.length === 0 ? (
            <p className="text-sm text-ink-muted">Nothing yet.</p>
          ) : (
            <ul className="card divide-y divide-rule">
              {o.activity.map((a, k) => (
                <li key={k} className="flex items-baseline gap-2 px-3 py-1.5 text-sm">
                  <span className="w-20 shrink-0 text-2xs uppercase tracking-wide text-ink-muted">
                    {a.kind === "run" ? "plate run" : a.kind}
                  </span>
                  <span className="min-w-0 flex-1">
                    <span className="block truncate">
                      {a.kind === "run" ? (
                        <Link href={`${base}/plates/runs/${a.ref}`}>{a.what}</Link>
                      ) : a.kind === "analysis" ? (
                        <Link href={`${base}/analyses/${a.ref}`}>{a.what}</Link>
                      ) : (
                        <>
                          comment on <span className="font-mono">{a.what}</span>
                        </>
                      )}
                    </span>
                    <span className="block text-2xs text-ink-muted">
                      {a.by ?? "—"} · {when(a.at)}
                    </span>
                  </span>
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
      {campaign.assayNotes ? (
        <section>
          <h3 className="mb-1">Assay notes</h3>
          <p className="max-w-prose whitespace-pre-line text-sm text-ink-soft">{campaign.assayNotes}</p>
        </section>
      ) : null}
    </div>
  );
}
