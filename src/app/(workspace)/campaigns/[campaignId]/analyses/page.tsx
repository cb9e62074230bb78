import Link from "next/link";
import { pageCampaign } from "@/server/auth/page-guard";
import { listExperiments } from "@/server/services/analyses";
import { listRuns } from "@/server/services/plates";
import { can } from "@/lib/roles";
import { EmptyState } from "@/components/ui/empty-state";
import { NewExperimentForm } from "./_components/new-experiment-form";
import { AnalysisStatusChip, kindLabel } from "./_components/labels";
import { createExperimentAction } from "./actions";

export const metadata = { title: "Analyses" };

export default async function AnalysesPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const [list, runs] = await Promise.all([listExperiments(campaignId), listRuns(campaignId)]);
  const mayRun = can(user.globalRole, role, "analysis:run");
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Analyses</h1>
        <p className="text-sm text-ink-muted">
          An experiment is a set of plate runs analysed together. Only accepted runs count; masked wells are left out;
          replicates of a compound are pooled across plates. Every analysis records the engine version, its settings,
          the runs&rsquo; SHA-256 checksums and the masks.
        </p>
      </div>
      {list.length === 0 ? (
        <EmptyState title="No experiments yet.">Create one from accepted plate runs below.</EmptyState>
      ) : (
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Experiment</th>
              <th>Kind</th>
              <th className="text-right">Runs (accepted / all)</th>
              <th>Latest analysis</th>
              <th className="text-right">Compounds</th>
              <th>Requested (UTC)</th>
            </tr>
          </thead>
          <tbody>
            {list.map((e) => (
              <tr key={e.experiment.id}>
                <td>
                  <Link href={`/campaigns/${campaignId}/analyses/${e.experiment.id}`}>{e.experiment.name}</Link>
                </td>
                <td>{kindLabel[e.experiment.kind]}</td>
                <td className="num text-right">
                  {e.acceptedRuns} / {e.runs}
                </td>
                <td>
                  {e.latest ? (
                    <AnalysisStatusChip status={e.latest.status} progress={e.latest.progress} />
                  ) : (
                    <span className="text-ink-muted">not run</span>
                  )}
                </td>
                <td className="num text-right">{e.current?.compounds ?? "—"}</td>
                <td className="num text-ink-muted">
                  {e.latest ? e.latest.requestedAt.toISOString().slice(0, 16).replace("T", " ") : "—"}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {mayRun ? (
        <section>
          <h3 className="mb-2">New experiment</h3>
          <NewExperimentForm
            action={createExperimentAction}
            campaignId={campaignId}
            defaultThresholdPct={campaign.hitThresholdPct}
            runs={runs.map((r) => ({
              id: r.id,
              label: r.barcode ? `${r.barcode} · ${r.fileName}` : r.fileName,
              map: r.plateMapName,
              readout: r.readout,
              decision: r.decision,
              zPrime: r.zPrime,
            }))}
          />
        </section>
      ) : (
        <p className="text-xs text-ink-muted">
          Assay scientists and project leads create experiments and run analyses.
        </p>
      )}
    </div>
  );
}
