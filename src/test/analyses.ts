// Test set-up for analysis routes and actions: the small invented plate of src/test/plates.ts,
// accepted, in a single-dose experiment with one finished analysis (made once per world).
import type { World } from "./harness";
import { platesWorld, campaignRow } from "./plates";
import { decideRun } from "@/server/services/plates";
import { createExperiment, requestAnalysis, runAnalysis } from "@/server/services/analyses";

const cache = new Map<string, Promise<{ experimentId: string; analysisId: string; runId: string }>>();

export function analysesWorld(w: World) {
  let p = cache.get(w.tag);
  if (!p) {
    p = (async () => {
      const { runId } = await platesWorld(w);
      await decideRun(w.people.assay, w.campaignId, runId, "accepted", "QC passes (test)").catch(() => {});
      const campaign = await campaignRow(w.campaignId);
      const { id: experimentId } = await createExperiment(w.people.assay, campaign, {
        name: `Matrix experiment ${w.tag}`,
        kind: "single-dose",
        runIds: [runId],
      });
      const a = await requestAnalysis(w.people.assay, campaign, experimentId);
      await runAnalysis(a.id);
      return { experimentId, analysisId: a.id, runId };
    })();
    cache.set(w.tag, p);
  }
  return p;
}
