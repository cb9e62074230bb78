// Role matrix: every route handler and server action is listed in src/server/registry.ts, and
// each is called here as every kind of person (signed out, non-member, each role, admin).
// Reference: the roles table in the product design (docs/product.md); "not a member → 404,
// not 403" from the accounts issue.
import { describe, it, expect, beforeAll, afterAll } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { registry, allActors, type RegistryActor } from "./registry";
import {
  makeWorld,
  userOf,
  callRoute,
  callAction,
  deniedRoute,
  deniedAction,
  newTestUser,
  TEST_PASSWORD,
  type TestUser,
  type World,
} from "@/test/harness";
import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { compounds, hitRows, memberships, plateMaps } from "@/server/db/schema";

import * as health from "@/app/api/health/route";
import * as openapiDoc from "@/app/api/openapi.json/route";
import * as me from "@/app/api/me/route";
import * as campaignsRoute from "@/app/api/campaigns/route";
import * as authActions from "@/app/(auth)/actions";
import * as settingsActions from "@/app/(workspace)/settings/actions";
import * as campaignActions from "@/app/(workspace)/campaigns/actions";
import * as teamActions from "@/app/(workspace)/campaigns/[campaignId]/team/actions";
import * as plateMapsRoute from "@/app/api/campaigns/[campaignId]/plate-maps/route";
import * as plateRunsRoute from "@/app/api/campaigns/[campaignId]/plate-runs/route";
import * as plateRunPreview from "@/app/api/campaigns/[campaignId]/plate-runs/preview/route";
import * as plateRunRoute from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/route";
import * as plateRunFile from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/route";
import * as plateActions from "@/app/(workspace)/campaigns/[campaignId]/plates/actions";
import { platesWorld, smallExport, smallMap } from "@/test/plates";
import { maskWell } from "@/server/services/plates";
import { plateMapToCsv } from "@/lib/plates";
import * as compoundsRoute from "@/app/api/compounds/route";
import * as compoundRoute from "@/app/api/compounds/[registryId]/route";
import * as compoundImportsRoute from "@/app/api/compound-imports/route";
import * as compoundImportRoute from "@/app/api/compound-imports/[importId]/route";
import * as compoundImportCommit from "@/app/api/compound-imports/[importId]/commit/route";
import * as compoundImportReport from "@/app/api/compound-imports/[importId]/report/route";
import * as compoundActions from "@/app/(workspace)/compounds/actions";
import { compoundsWorld, importFile, uniqueSmiles } from "@/test/compounds";
import { addToLibrary, registerCompound, startImport } from "@/server/services/compounds";
import * as experimentsRoute from "@/app/api/campaigns/[campaignId]/experiments/route";
import * as analysesRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/route";
import * as analysisRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/route";
import * as resultsRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/route";
import * as analysisRetryRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/retry/route";
import * as analysisActions from "@/app/(workspace)/campaigns/[campaignId]/analyses/actions";
import { analysesWorld } from "@/test/analyses";
import * as plateRunDecision from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/decision/route";
import * as plateRunMasks from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/route";
import * as plateRunMask from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/[well]/route";
import * as plateMapRoute from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route";
import * as plateMapCopy from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/copy/route";
import * as experimentRoute from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/route";
import * as resultOverride from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/override/route";
import * as resultPlan from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/plan/route";
import { createPlateMap } from "@/server/services/plates";
import { DEFAULT_REGISTRY_PREFIX, formatRegistryId } from "@/lib/registry-id";
import * as hitsRoute from "@/app/api/campaigns/[campaignId]/hits/route";
import * as hitRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/route";
import * as hitCommentsRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/comments/route";
import * as hitStructureRoute from "@/app/api/campaigns/[campaignId]/hits/[registryId]/structure/route";
import * as hitExportRoute from "@/app/api/campaigns/[campaignId]/hits/export/route";
import * as hitViewsRoute from "@/app/api/campaigns/[campaignId]/hits/views/route";
import * as hitViewRoute from "@/app/api/campaigns/[campaignId]/hits/views/[viewId]/route";
import { saveView } from "@/server/services/hits";
import { stopBoss } from "@/server/jobs/boss";
import * as digestRoute from "@/app/api/campaigns/[campaignId]/digest/route";
import * as digestLogRoute from "@/app/api/campaigns/[campaignId]/digest/log/route";
import * as digestActions from "@/app/(workspace)/campaigns/[campaignId]/digest/actions";
import * as stopDigest from "@/app/(auth)/digest/actions";
// Issue 16 (2b) routes
import * as compoundBatchesRoute from "@/app/api/compounds/[registryId]/batches/route";
import * as compoundStocksRoute from "@/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/route";
import * as librariesRoute from "@/app/api/libraries/route";
import * as libraryRoute from "@/app/api/libraries/[libraryId]/route";
import * as libraryMembersRoute from "@/app/api/libraries/[libraryId]/members/route";
import * as libraryMemberRoute from "@/app/api/libraries/[libraryId]/members/[registryId]/route";
import * as thresholdsRoute from "@/app/api/campaigns/[campaignId]/thresholds/route";
import * as membersRoute from "@/app/api/campaigns/[campaignId]/members/route";
import * as memberRoute from "@/app/api/campaigns/[campaignId]/members/[userId]/route";
import * as auditRoute from "@/app/api/audit/route";
import * as myDigestRoute from "@/app/api/me/digest/route";
// End of issue 16 (2b) routes

// Issue 16 (4) routes
import * as plateBatchesRoute from "@/app/api/campaigns/[campaignId]/plate-batches/route";
import * as plateBatchRoute from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/route";
import * as plateBatchAssign from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/files/[fileId]/assign/route";
import * as plateBatchAccept from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/accept-passing/route";
import { batchWorld, unmatchedFile } from "@/test/plate-batches";
// End of issue 16 (4) routes

// Personal API tokens: their routes' invokers and the matrix run with tokens
import { brokenTokenMatrix, tokenInvokers, tokenMatrix } from "@/test/token-matrix";

type Invoke = (actor: RegistryActor, w: World) => Promise<boolean>; // true = denied

const route =
  (mod: unknown, path: string, method = "GET", body?: unknown): Invoke =>
  async (actor, w) =>
    deniedRoute((await callRoute(mod, { user: userOf(w, actor), path, method, body })).status);

const invokers: Record<string, Invoke> = {
  ...tokenInvokers,
  "src/app/api/health/route.ts#GET": route(health.GET, "/api/health"),
  "src/app/api/openapi.json/route.ts#GET": route(openapiDoc.GET, "/api/openapi.json"),
  "src/app/api/me/route.ts#GET": route(me.GET, "/api/me"),
  "src/app/api/campaigns/route.ts#GET": route(campaignsRoute.GET, "/api/campaigns"),
  "src/app/(auth)/actions.ts#signInAction": async (actor, w) => {
    const u = await newTestUser(`signin-${actor}`);
    const o = await callAction(authActions.signInAction, { email: u.email, password: TEST_PASSWORD }, userOf(w, actor));
    return !(o.kind === "redirect" && o.to === "/campaigns");
  },
  "src/app/(auth)/actions.ts#signOutAction": async (actor, w) => {
    const o = await callAction(authActions.signOutAction, {}, userOf(w, actor));
    return !(o.kind === "redirect" && o.to === "/sign-in");
  },
  "src/app/(auth)/actions.ts#requestResetAction": async (actor, w) =>
    deniedAction(
      await callAction(authActions.requestResetAction, { email: `nobody-${actor}@test.invalid` }, userOf(w, actor)),
    ),
  "src/app/(auth)/actions.ts#resetPasswordAction": async (actor, w) =>
    deniedAction(
      await callAction(
        authActions.resetPasswordAction,
        { token: "x".repeat(40), password: "a-long-new-password" },
        userOf(w, actor),
      ),
    ),
  "src/app/(auth)/actions.ts#acceptInviteAction": async (actor, w) =>
    deniedAction(
      await callAction(
        authActions.acceptInviteAction,
        { token: "y".repeat(40), name: "N", password: "a-long-new-password" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/settings/actions.ts#changePasswordAction": async (actor, w) => {
    // A wrong current password: allowed callers reach the check (400), others are refused first.
    const o = await callAction(
      settingsActions.changePasswordAction,
      { current: "wrong-password", password: "another-long-password" },
      userOf(w, actor),
    );
    return deniedAction(o);
  },
  "src/app/(workspace)/campaigns/actions.ts#createCampaignAction": async (actor, w) =>
    deniedAction(
      await callAction(
        campaignActions.createCampaignAction,
        { name: `Matrix ${actor}`, targetEnzyme: "Invented enzyme" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#inviteAction": async (actor, w) =>
    deniedAction(
      await callAction(
        teamActions.inviteAction,
        { campaignId: w.campaignId, email: `invitee-${actor}-${w.tag}@test.invalid`, role: "viewer" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#changeRoleAction": async (actor, w) =>
    deniedAction(
      await callAction(
        teamActions.changeRoleAction,
        { campaignId: w.campaignId, userId: w.people.viewer.id, role: "viewer" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#removeMemberAction": async (actor, w) => {
    const target = await newTestUser(`removable-${actor}`);
    await db.insert(memberships).values({ campaignId: w.campaignId, userId: target.id, role: "viewer" });
    return deniedAction(
      await callAction(
        teamActions.removeMemberAction,
        { campaignId: w.campaignId, userId: target.id },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#updateThresholdsAction": async (actor, w) =>
    deniedAction(
      await callAction(
        teamActions.updateThresholdsAction,
        { campaignId: w.campaignId, qcMinZPrime: "0.5", qcMaxCvPct: "20", hitThresholdPct: "50" },
        userOf(w, actor),
      ),
    ),
  // Plates: allowed callers get 200/201 (or 409 for a repeat), refused ones 401/403/404.
  "src/app/api/campaigns/[campaignId]/plate-maps/route.ts#GET": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(plateMapsRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/plate-maps`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    ),
  "src/app/api/campaigns/[campaignId]/plate-maps/route.ts#POST": async (actor, w) => {
    await platesWorld(w); // registers the compounds the map names
    const form = new FormData();
    form.append("name", `Matrix import ${actor}`);
    form.append("format", "96");
    form.append("file", new File([plateMapToCsv(smallMap())], "map.csv", { type: "text/csv" }));
    return deniedRoute(
      (
        await callRoute(plateMapsRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-maps`,
          params: { campaignId: w.campaignId },
          body: form,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/route.ts#GET": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(plateRunsRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/plate-runs`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    ),
  "src/app/api/campaigns/[campaignId]/plate-runs/route.ts#POST": async (actor, w) => {
    const { mapId } = await platesWorld(w);
    const form = new FormData();
    form.append("plateMapId", mapId);
    form.append("file", new File([smallExport(1000 + actor.length)], `matrix-${actor}.csv`, { type: "text/csv" }));
    return deniedRoute(
      (
        await callRoute(plateRunsRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-runs`,
          params: { campaignId: w.campaignId },
          body: form,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/preview/route.ts#POST": async (actor, w) => {
    const { mapId } = await platesWorld(w);
    const form = new FormData();
    form.append("plateMapId", mapId);
    form.append("file", new File([smallExport(2000)], "preview.csv", { type: "text/csv" }));
    return deniedRoute(
      (
        await callRoute(plateRunPreview.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-runs/preview`,
          params: { campaignId: w.campaignId },
          body: form,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/route.ts#GET": async (actor, w) => {
    const { runId } = await platesWorld(w);
    return deniedRoute(
      (
        await callRoute(plateRunRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/plate-runs/${runId}`,
          params: { campaignId: w.campaignId, runId },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/route.ts#GET": async (actor, w) => {
    const { runId } = await platesWorld(w);
    return deniedRoute(
      (
        await callRoute(plateRunFile.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/plate-runs/${runId}/file`,
          params: { campaignId: w.campaignId, runId },
        })
      ).status,
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#savePlateMapAction": async (actor, w) => {
    await platesWorld(w);
    const m = smallMap();
    const mapJson = JSON.stringify({ format: 96, wells: m.wells.filter((x) => x.role !== "empty") });
    return deniedAction(
      await callAction(
        plateActions.savePlateMapAction,
        { campaignId: w.campaignId, name: `Matrix editor ${actor}`, signalDirection: "falls", mapJson },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#maskWellAction": async (actor, w) => {
    const { runId } = await platesWorld(w);
    return deniedAction(
      await callAction(
        plateActions.maskWellAction,
        { campaignId: w.campaignId, runId, well: `C${2 + actor.length}`, reason: "bubble seen in well" },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#unmaskWellAction": async (actor, w) => {
    const { runId } = await platesWorld(w);
    const well = `D${1 + actor.length}`;
    await maskWell(w.people.assay, w.campaignId, runId, well, "set-up for the unmask check").catch(() => undefined);
    return deniedAction(
      await callAction(
        plateActions.unmaskWellAction,
        { campaignId: w.campaignId, runId, well, reason: "reading is fine after review" },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#decideRunAction": async (actor, w) => {
    const { runId } = await platesWorld(w);
    return deniedAction(
      await callAction(
        plateActions.decideRunAction,
        { campaignId: w.campaignId, runId, decision: "rejected", reason: "role-matrix check" },
        userOf(w, actor),
      ),
    );
  },
  // Compounds: allowed callers get 200/201/202 (or 409 for a repeat), refused ones 401/403.
  "src/app/api/compounds/route.ts#GET": route(compoundsRoute.GET, "/api/compounds?q=INH&limit=5"),
  "src/app/api/compounds/route.ts#POST": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(compoundsRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: "/api/compounds",
          body: { smiles: uniqueSmiles(), name: `Matrix ${actor}` },
        })
      ).status,
    ),
  "src/app/api/compounds/[registryId]/route.ts#GET": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    return deniedRoute(
      (
        await callRoute(compoundRoute.GET, {
          user: userOf(w, actor),
          path: `/api/compounds/${registryId}`,
          params: { registryId },
        })
      ).status,
    );
  },
  "src/app/api/compound-imports/route.ts#POST": async (actor, w) => {
    const form = new FormData();
    form.append(
      "file",
      new File([`smiles,name\n${uniqueSmiles()},M-${actor}\n`], `matrix-${actor}.csv`, { type: "text/csv" }),
    );
    return deniedRoute(
      (
        await callRoute(compoundImportsRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: "/api/compound-imports",
          body: form,
        })
      ).status,
    );
  },
  "src/app/api/compound-imports/[importId]/route.ts#GET": async (actor, w) => {
    const { importId } = await compoundsWorld(w);
    return deniedRoute(
      (
        await callRoute(compoundImportRoute.GET, {
          user: userOf(w, actor),
          path: `/api/compound-imports/${importId}`,
          params: { importId },
        })
      ).status,
    );
  },
  "src/app/api/compound-imports/[importId]/commit/route.ts#POST": async (actor, w) => {
    const importId = await importFile(w, `commit-${actor}.csv`, `smiles,name\n${uniqueSmiles()},C-${actor}\n`);
    return deniedRoute(
      (
        await callRoute(compoundImportCommit.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/compound-imports/${importId}/commit`,
          params: { importId },
          body: { mode: "valid_only" },
        })
      ).status,
    );
  },
  "src/app/api/compound-imports/[importId]/report/route.ts#GET": async (actor, w) => {
    const { importId } = await compoundsWorld(w);
    return deniedRoute(
      (
        await callRoute(compoundImportReport.GET, {
          user: userOf(w, actor),
          path: `/api/compound-imports/${importId}/report`,
          params: { importId },
        })
      ).status,
    );
  },
  "src/app/(workspace)/compounds/actions.ts#registerCompoundAction": async (actor, w) =>
    deniedAction(
      await callAction(
        compoundActions.registerCompoundAction,
        { smiles: uniqueSmiles(), name: `Matrix form ${actor}`, "batch.supplier": "Invented Supplier" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/compounds/actions.ts#addBatchAction": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    return deniedAction(
      await callAction(
        compoundActions.addBatchAction,
        { registryId, "batch.supplier": `Supplier ${actor}`, "batch.purityPct": "97" },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/compounds/actions.ts#addStockAction": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    return deniedAction(
      await callAction(
        compoundActions.addStockAction,
        { registryId, batchNumber: "1", "stock.concentrationMm": "10", "stock.solvent": "DMSO" },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/compounds/actions.ts#editCompoundAction": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    return deniedAction(
      await callAction(
        compoundActions.editCompoundAction,
        { registryId, name: `Renamed by ${actor} (invented)` },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/compounds/actions.ts#createLibraryAction": async (actor, w) =>
    deniedAction(
      await callAction(
        compoundActions.createLibraryAction,
        { name: `Matrix library ${actor} ${w.tag}` },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/compounds/actions.ts#addToLibraryAction": async (actor, w) => {
    const { registryId, libraryId } = await compoundsWorld(w);
    return deniedAction(
      await callAction(compoundActions.addToLibraryAction, { libraryId, ids: registryId }, userOf(w, actor)),
    );
  },
  "src/app/(workspace)/compounds/actions.ts#removeFromLibraryAction": async (actor, w) => {
    const { registryId, libraryId } = await compoundsWorld(w);
    await addToLibrary(w.people.admin, libraryId, registryId);
    return deniedAction(
      await callAction(compoundActions.removeFromLibraryAction, { libraryId, registryId }, userOf(w, actor)),
    );
  },
  "src/app/api/campaigns/[campaignId]/experiments/route.ts#GET": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(experimentsRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/experiments`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    ),
  "src/app/api/campaigns/[campaignId]/experiments/route.ts#POST": async (actor, w) => {
    const { runId } = await analysesWorld(w);
    const r = await callRoute(experimentsRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/experiments`,
      params: { campaignId: w.campaignId },
      body: { name: `E ${actor}`, kind: "single-dose", runIds: [runId] },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/route.ts#POST": async (actor, w) => {
    const { experimentId } = await analysesWorld(w);
    const r = await callRoute(analysesRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}/analyses`,
      params: { campaignId: w.campaignId, experimentId },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/route.ts#GET": async (
    actor,
    w,
  ) => {
    const { experimentId, analysisId } = await analysesWorld(w);
    const path = `/api/campaigns/${w.campaignId}/experiments/${experimentId}/analyses/${analysisId}`;
    return deniedRoute(
      (
        await callRoute(analysisRoute.GET, {
          user: userOf(w, actor),
          path,
          params: { campaignId: w.campaignId, experimentId, analysisId },
        })
      ).status,
    );
  },
  // The world's analysis is not failed: allowed callers reach the check (409), others are refused first.
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/retry/route.ts#POST": async (
    actor,
    w,
  ) => {
    const { experimentId, analysisId } = await analysesWorld(w);
    const r = await callRoute(analysisRetryRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}/analyses/${analysisId}/retry`,
      params: { campaignId: w.campaignId, experimentId, analysisId },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/route.ts#GET": async (actor, w) => {
    const { experimentId } = await analysesWorld(w);
    const path = `/api/campaigns/${w.campaignId}/experiments/${experimentId}/results`;
    return deniedRoute(
      (
        await callRoute(resultsRoute.GET, {
          user: userOf(w, actor),
          path,
          params: { campaignId: w.campaignId, experimentId },
        })
      ).status,
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#createExperimentAction": async (actor, w) => {
    const { runId } = await analysesWorld(w);
    return deniedAction(
      await callAction(
        analysisActions.createExperimentAction,
        { campaignId: w.campaignId, name: `Form ${actor}`, kind: "single-dose", runIds: runId },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#startAnalysisAction": async (actor, w) => {
    const { experimentId } = await analysesWorld(w);
    return deniedAction(
      await callAction(
        analysisActions.startAnalysisAction,
        { campaignId: w.campaignId, experimentId },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#overrideMechanismAction": async (actor, w) => {
    // A single-dose experiment has no model choice: allowed callers reach that check (400).
    const { experimentId } = await analysesWorld(w);
    return deniedAction(
      await callAction(
        analysisActions.overrideMechanismAction,
        {
          campaignId: w.campaignId,
          experimentId,
          compoundId: "INH-000001",
          model: "mixed",
          reason: "matrix test reason",
        },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#saveCurationAction": async (actor, w) => {
    // Each caller excludes its own sample well (C5…C11 hold INH-000005…INH-000011): allowed callers
    // store the mask, refused ones are stopped before any write.
    const { experimentId, runId } = await analysesWorld(w);
    const k = 5 + allActors.indexOf(actor);
    const edits = [{ runId, well: `C${k}`, masked: true, reason: "curation role-matrix check" }];
    return deniedAction(
      await callAction(
        analysisActions.saveCurationAction,
        {
          campaignId: w.campaignId,
          experimentId,
          compoundId: formatRegistryId(DEFAULT_REGISTRY_PREFIX, k),
          edits: JSON.stringify(edits),
        },
        userOf(w, actor),
      ),
    );
  },
  "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#planMechanismPlateAction": async (actor, w) => {
    await analysesWorld(w);
    return deniedAction(
      await callAction(
        analysisActions.planMechanismPlateAction,
        {
          campaignId: w.campaignId,
          compoundId: "INH-000001",
          ic50Um: "2",
          kmUm: "20",
          format: "384",
          name: `Plan ${actor} ${w.tag}`,
        },
        userOf(w, actor),
      ),
    );
  },
  // Plate runs, plate maps, experiments, overrides and the planner in the JSON API. Allowed
  // callers get 2xx, or 409/400 where an earlier caller changed the same thing; refused ones 401/403/404.
  "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/decision/route.ts#POST": async (actor, w) => {
    const { runId } = await platesWorld(w);
    const path = `/api/campaigns/${w.campaignId}/plate-runs/${runId}/decision`;
    const r = await callRoute(plateRunDecision.POST, {
      user: userOf(w, actor),
      method: "POST",
      path,
      params: { campaignId: w.campaignId, runId },
      body: { decision: "accept", reason: "role-matrix check: QC passes" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/route.ts#POST": async (actor, w) => {
    const { runId } = await platesWorld(w);
    const r = await callRoute(plateRunMasks.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-runs/${runId}/masks`,
      params: { campaignId: w.campaignId, runId },
      body: { wells: ["C12"], reason: "role-matrix check" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/[well]/route.ts#DELETE": async (actor, w) => {
    const { runId } = await platesWorld(w);
    const r = await callRoute(plateRunMask.DELETE, {
      user: userOf(w, actor),
      method: "DELETE",
      path: `/api/campaigns/${w.campaignId}/plate-runs/${runId}/masks/C12`,
      params: { campaignId: w.campaignId, runId, well: "C12" },
      body: { reason: "role-matrix check" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#GET": async (actor, w) => {
    const { mapId } = await platesWorld(w);
    const r = await callRoute(plateMapRoute.GET, {
      user: userOf(w, actor),
      path: `/api/campaigns/${w.campaignId}/plate-maps/${mapId}`,
      params: { campaignId: w.campaignId, plateMapId: mapId },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#PATCH": async (actor, w) => {
    const { mapId } = await platesWorld(w); // runs use it: allowed callers reach that check (409)
    const r = await callRoute(plateMapRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/campaigns/${w.campaignId}/plate-maps/${mapId}`,
      params: { campaignId: w.campaignId, plateMapId: mapId },
      body: { name: `Renamed ${actor} ${w.tag}` },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#DELETE": async (actor, w) => {
    await platesWorld(w);
    const { id } = await createPlateMap(w.people.assay, w.campaignId, { name: `Unused ${actor}`, map: smallMap() });
    const r = await callRoute(plateMapRoute.DELETE, {
      user: userOf(w, actor),
      method: "DELETE",
      path: `/api/campaigns/${w.campaignId}/plate-maps/${id}`,
      params: { campaignId: w.campaignId, plateMapId: id },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/copy/route.ts#POST": async (actor, w) => {
    const { mapId } = await platesWorld(w);
    const r = await callRoute(plateMapCopy.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/plate-maps/${mapId}/copy`,
      params: { campaignId: w.campaignId, plateMapId: mapId },
      body: { name: `Copy ${actor} ${w.tag}` },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/route.ts#PATCH": async (actor, w) => {
    const { experimentId, runId } = await analysesWorld(w); // the same run set: nothing changes
    const r = await callRoute(experimentRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}`,
      params: { campaignId: w.campaignId, experimentId },
      body: { runIds: [runId] },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/override/route.ts#POST": async (
    actor,
    w,
  ) => {
    // A single-dose experiment has no model choice: allowed callers reach that check (400).
    const { experimentId } = await analysesWorld(w);
    const registryId = formatRegistryId(DEFAULT_REGISTRY_PREFIX, 1);
    const r = await callRoute(resultOverride.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}/results/${registryId}/override`,
      params: { campaignId: w.campaignId, experimentId, registryId },
      body: { model: "mixed", reason: "matrix test reason" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/plan/route.ts#POST": async (
    actor,
    w,
  ) => {
    const { experimentId } = await analysesWorld(w);
    const registryId = formatRegistryId(DEFAULT_REGISTRY_PREFIX, 1);
    const r = await callRoute(resultPlan.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/experiments/${experimentId}/results/${registryId}/plan`,
      params: { campaignId: w.campaignId, experimentId, registryId },
      body: { name: `API plan ${actor} ${w.tag}`, format: 384, ic50Um: 2, kmUm: 20 },
    });
    return deniedRoute(r.status);
  },
  // End of plate runs, plate maps, experiments, overrides and the planner in the JSON API
  // Hit triage: the world's single-dose analysis gives INH-000001…INH-000012 hit rows.
  "src/app/api/campaigns/[campaignId]/hits/route.ts#GET": async (actor, w) => {
    await analysesWorld(w);
    return deniedRoute(
      (
        await callRoute(hitsRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/hits?sort=ki&limit=5`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/route.ts#PATCH": async (actor, w) => {
    await analysesWorld(w);
    const body = { registryIds: ["INH-000003", "INH-000004"], status: "on hold", comment: `matrix ${actor}` };
    return deniedRoute(
      (
        await callRoute(hitsRoute.PATCH, {
          user: userOf(w, actor),
          method: "PATCH",
          path: `/api/campaigns/${w.campaignId}/hits`,
          params: { campaignId: w.campaignId },
          body,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/[registryId]/route.ts#GET": async (actor, w) => {
    await analysesWorld(w);
    const params = { campaignId: w.campaignId, registryId: "INH-000001" };
    return deniedRoute(
      (
        await callRoute(hitRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/hits/INH-000001`,
          params,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/[registryId]/route.ts#PATCH": async (actor, w) => {
    await analysesWorld(w);
    const params = { campaignId: w.campaignId, registryId: "INH-000002" };
    return deniedRoute(
      (
        await callRoute(hitRoute.PATCH, {
          user: userOf(w, actor),
          method: "PATCH",
          path: `/api/campaigns/${w.campaignId}/hits/INH-000002`,
          params,
          body: { status: "confirmed" },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/[registryId]/comments/route.ts#POST": async (actor, w) => {
    await analysesWorld(w);
    const params = { campaignId: w.campaignId, registryId: "INH-000001" };
    const r = await callRoute(hitCommentsRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/hits/INH-000001/comments`,
      params,
      body: { body: `matrix note by ${actor}` },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/hits/[registryId]/structure/route.ts#GET": async (actor, w) => {
    await analysesWorld(w);
    const params = { campaignId: w.campaignId, registryId: "INH-000001" };
    return deniedRoute(
      (
        await callRoute(hitStructureRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/hits/INH-000001/structure`,
          params,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/export/route.ts#GET": async (actor, w) => {
    await analysesWorld(w);
    return deniedRoute(
      (
        await callRoute(hitExportRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/hits/export?format=csv`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/views/route.ts#GET": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(hitViewsRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/hits/views`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    ),
  "src/app/api/campaigns/[campaignId]/hits/views/route.ts#POST": async (actor, w) => {
    const body = {
      name: `Matrix view ${actor}`,
      state: { columns: [{ colId: "ki", width: 120 }], query: { sort: "ki", status: "unreviewed" } },
    };
    return deniedRoute(
      (
        await callRoute(hitViewsRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/hits/views`,
          params: { campaignId: w.campaignId },
          body,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/hits/views/[viewId]/route.ts#DELETE": async (actor, w) => {
    // Each member deletes a view of their own; others name a view id that is not theirs.
    const owner = actor === "signedOut" || actor === "nonMember" ? w.people.lead : w.people[actor];
    const { id: viewId } = await saveView(owner.id, w.campaignId, `To delete ${actor}`, { columns: [], query: {} });
    const params = { campaignId: w.campaignId, viewId };
    return deniedRoute(
      (
        await callRoute(hitViewRoute.DELETE, {
          user: userOf(w, actor),
          method: "DELETE",
          path: `/api/campaigns/${w.campaignId}/hits/views/${viewId}`,
          params,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/digest/route.ts#POST": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(digestRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/digest`,
          params: { campaignId: w.campaignId },
          body: { preview: true },
        })
      ).status,
    ),
  "src/app/api/campaigns/[campaignId]/digest/log/route.ts#GET": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(digestLogRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/digest/log`,
          params: { campaignId: w.campaignId },
        })
      ).status,
    ),
  "src/app/(workspace)/campaigns/[campaignId]/digest/actions.ts#sendDigestNowAction": async (actor, w) =>
    deniedAction(await callAction(digestActions.sendDigestNowAction, { campaignId: w.campaignId }, userOf(w, actor))),
  "src/app/(workspace)/campaigns/[campaignId]/digest/actions.ts#setDigestScheduleAction": async (actor, w) =>
    deniedAction(
      await callAction(
        digestActions.setDigestScheduleAction,
        { campaignId: w.campaignId, digestWeekday: "1", digestHour: "7", timeZone: "UTC" },
        userOf(w, actor),
      ),
    ),
  "src/app/(workspace)/settings/actions.ts#setMyDigestAction": async (actor, w) =>
    deniedAction(
      await callAction(settingsActions.setMyDigestAction, { campaignId: w.campaignId, receive: "1" }, userOf(w, actor)),
    ),
  "src/app/(auth)/digest/actions.ts#stopDigestAction": async (actor, w) =>
    deniedAction(
      await callAction(stopDigest.stopDigestAction, { token: "not-a-valid-token.at-all" }, userOf(w, actor)),
    ),
  // Issue 16 (2b): allowed callers get 2xx with valid input; refused ones 401/403/404.
  "src/app/api/compounds/[registryId]/route.ts#PATCH": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    const r = await callRoute(compoundRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/compounds/${registryId}`,
      params: { registryId },
      body: { name: `Renamed by ${actor} (invented)` },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/compounds/[registryId]/batches/route.ts#GET": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    const path = `/api/compounds/${registryId}/batches`;
    return deniedRoute(
      (await callRoute(compoundBatchesRoute.GET, { user: userOf(w, actor), path, params: { registryId } })).status,
    );
  },
  "src/app/api/compounds/[registryId]/batches/route.ts#POST": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    const r = await callRoute(compoundBatchesRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/compounds/${registryId}/batches`,
      params: { registryId },
      body: { batch: { supplier: `Supplier ${actor} (invented)`, purityPct: 97 } },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/route.ts#GET": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    const params = { registryId, batchNumber: "1" };
    const path = `/api/compounds/${registryId}/batches/1/stocks`;
    return deniedRoute((await callRoute(compoundStocksRoute.GET, { user: userOf(w, actor), path, params })).status);
  },
  "src/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/route.ts#POST": async (actor, w) => {
    const { registryId } = await compoundsWorld(w);
    const r = await callRoute(compoundStocksRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/compounds/${registryId}/batches/1/stocks`,
      params: { registryId, batchNumber: "1" },
      body: { concentrationMm: 10, solvent: "DMSO" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/libraries/route.ts#GET": route(librariesRoute.GET, "/api/libraries"),
  "src/app/api/libraries/route.ts#POST": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(librariesRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: "/api/libraries",
          body: { name: `API library ${actor} ${w.tag}` },
        })
      ).status,
    ),
  "src/app/api/libraries/[libraryId]/route.ts#GET": async (actor, w) => {
    const { libraryId } = await compoundsWorld(w);
    const path = `/api/libraries/${libraryId}`;
    return deniedRoute(
      (await callRoute(libraryRoute.GET, { user: userOf(w, actor), path, params: { libraryId } })).status,
    );
  },
  "src/app/api/libraries/[libraryId]/members/route.ts#POST": async (actor, w) => {
    const { registryId, libraryId } = await compoundsWorld(w);
    const r = await callRoute(libraryMembersRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/libraries/${libraryId}/members`,
      params: { libraryId },
      body: { registryIds: [registryId] },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/libraries/[libraryId]/members/[registryId]/route.ts#DELETE": async (actor, w) => {
    const { registryId, libraryId } = await compoundsWorld(w);
    await addToLibrary(w.people.admin, libraryId, registryId);
    const r = await callRoute(libraryMemberRoute.DELETE, {
      user: userOf(w, actor),
      method: "DELETE",
      path: `/api/libraries/${libraryId}/members/${registryId}`,
      params: { libraryId, registryId },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/route.ts#POST": route(campaignsRoute.POST, "/api/campaigns", "POST", {
    name: "Matrix API campaign (invented)",
    targetEnzyme: "Invented enzyme",
  }),
  "src/app/api/campaigns/[campaignId]/thresholds/route.ts#GET": async (actor, w) => {
    const params = { campaignId: w.campaignId };
    const path = `/api/campaigns/${w.campaignId}/thresholds`;
    return deniedRoute((await callRoute(thresholdsRoute.GET, { user: userOf(w, actor), path, params })).status);
  },
  "src/app/api/campaigns/[campaignId]/thresholds/route.ts#PATCH": async (actor, w) => {
    const r = await callRoute(thresholdsRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/campaigns/${w.campaignId}/thresholds`,
      params: { campaignId: w.campaignId },
      body: { qcMinZPrime: 0.5 },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/digest/route.ts#PATCH": async (actor, w) => {
    const r = await callRoute(digestRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/campaigns/${w.campaignId}/digest`,
      params: { campaignId: w.campaignId },
      body: { digestHour: 7 },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/members/route.ts#GET": async (actor, w) => {
    const params = { campaignId: w.campaignId };
    const path = `/api/campaigns/${w.campaignId}/members`;
    return deniedRoute((await callRoute(membersRoute.GET, { user: userOf(w, actor), path, params })).status);
  },
  "src/app/api/campaigns/[campaignId]/members/route.ts#POST": async (actor, w) => {
    const r = await callRoute(membersRoute.POST, {
      user: userOf(w, actor),
      method: "POST",
      path: `/api/campaigns/${w.campaignId}/members`,
      params: { campaignId: w.campaignId },
      body: { email: `api-invitee-${actor}-${w.tag}@test.invalid`, role: "viewer" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/members/[userId]/route.ts#PATCH": async (actor, w) => {
    const userId = w.people.viewer.id;
    const r = await callRoute(memberRoute.PATCH, {
      user: userOf(w, actor),
      method: "PATCH",
      path: `/api/campaigns/${w.campaignId}/members/${userId}`,
      params: { campaignId: w.campaignId, userId },
      body: { role: "viewer" },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/campaigns/[campaignId]/members/[userId]/route.ts#DELETE": async (actor, w) => {
    const target = await newTestUser(`api-removable-${actor}`);
    await db.insert(memberships).values({ campaignId: w.campaignId, userId: target.id, role: "viewer" });
    const r = await callRoute(memberRoute.DELETE, {
      user: userOf(w, actor),
      method: "DELETE",
      path: `/api/campaigns/${w.campaignId}/members/${target.id}`,
      params: { campaignId: w.campaignId, userId: target.id },
    });
    return deniedRoute(r.status);
  },
  "src/app/api/audit/route.ts#GET": route(auditRoute.GET, "/api/audit?limit=5"),
  "src/app/api/me/digest/route.ts#GET": route(myDigestRoute.GET, "/api/me/digest"),
  "src/app/api/me/digest/route.ts#PUT": async (actor, w) =>
    deniedRoute(
      (
        await callRoute(myDigestRoute.PUT, {
          user: userOf(w, actor),
          method: "PUT",
          path: "/api/me/digest",
          body: { campaignId: w.campaignId, receive: true },
        })
      ).status,
    ),
  // End of issue 16 (2b).
  // Issue 16 (4): allowed callers get 2xx; refused ones 401/403/404.
  "src/app/api/campaigns/[campaignId]/plate-batches/route.ts#POST": async (actor, w) => {
    const { mapId } = await platesWorld(w);
    const form = new FormData();
    form.append("plateMapId", mapId);
    form.append("file", new File([smallExport(3000 + actor.length)], `batch-${actor}-a.csv`, { type: "text/csv" }));
    form.append("file", new File([smallExport(3100 + actor.length)], `batch-${actor}-b.csv`, { type: "text/csv" }));
    return deniedRoute(
      (
        await callRoute(plateBatchesRoute.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-batches?wait=true`,
          params: { campaignId: w.campaignId },
          body: form,
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/route.ts#GET": async (actor, w) => {
    const { batchId } = await batchWorld(w);
    return deniedRoute(
      (
        await callRoute(plateBatchRoute.GET, {
          user: userOf(w, actor),
          path: `/api/campaigns/${w.campaignId}/plate-batches/${batchId}`,
          params: { campaignId: w.campaignId, batchId },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/files/[fileId]/assign/route.ts#POST": async (
    actor,
    w,
  ) => {
    const { batchId, fileId, mapId } = await unmatchedFile(w, 4000 + actor.length * 7 + actor.charCodeAt(0));
    return deniedRoute(
      (
        await callRoute(plateBatchAssign.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-batches/${batchId}/files/${fileId}/assign`,
          params: { campaignId: w.campaignId, batchId, fileId },
          body: { plateMapId: mapId },
        })
      ).status,
    );
  },
  "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/accept-passing/route.ts#POST": async (actor, w) => {
    const { batchId } = await batchWorld(w);
    return deniedRoute(
      (
        await callRoute(plateBatchAccept.POST, {
          user: userOf(w, actor),
          method: "POST",
          path: `/api/campaigns/${w.campaignId}/plate-batches/${batchId}/accept-passing`,
          params: { campaignId: w.campaignId, batchId },
          body: { reason: "Controls and Z′ within limits (role matrix)" },
        })
      ).status,
    );
  },
  // End of issue 16 (4).
};

function walk(dir: string, out: string[] = []): string[] {
  for (const f of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, f.name);
    if (f.isDirectory()) walk(p, out);
    else if (/\.(ts|tsx)$/.test(f.name) && !/\.test\.tsx?$/.test(f.name)) out.push(p);
  }
  return out;
}

/** Every exported route handler and server action found in src/app. */
function discovered(): string[] {
  const ids: string[] = [];
  for (const file of walk("src/app")) {
    const src = fs.readFileSync(file, "utf8");
    const rel = file.split(path.sep).join("/");
    if (path.basename(file) === "route.ts") {
      for (const m of src.matchAll(
        /export\s+(?:const|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b/g,
      ))
        ids.push(`${rel}#${m[1]}`);
    } else if (/^\s*(["'])use server\1/.test(src)) {
      for (const m of src.matchAll(/export\s+(?:const|async\s+function|function)\s+(\w+)/g)) ids.push(`${rel}#${m[1]}`);
    }
  }
  return ids.sort();
}

describe("route and action registry", () => {
  it("lists every route handler and server action in src/app, and nothing that does not exist", () => {
    const found = discovered();
    const listed = registry.map((e) => e.id).sort();
    expect(
      found.filter((id) => !listed.includes(id)),
      "routes/actions missing from src/server/registry.ts",
    ).toEqual([]);
    expect(
      listed.filter((id) => !found.includes(id)),
      "registry entries with no route/action",
    ).toEqual([]);
  });
  it("has an invoker in this test for every registry entry", () => {
    expect(registry.map((e) => e.id).filter((id) => !invokers[id])).toEqual([]);
  });
});

describe("role matrix", () => {
  afterAll(() => stopBoss());
  let world: World;
  beforeAll(async () => {
    world = await makeWorld();
  });
  for (const entry of registry) {
    for (const actor of allActors) {
      const expected = entry.allow.includes(actor) ? "allowed" : "denied";
      it(`${entry.id} as ${actor} is ${expected}`, async () => {
        const denied = await invokers[entry.id]!(actor, world);
        expect(denied ? "denied" : "allowed").toBe(expected);
      });
    }
  }
});

tokenMatrix(invokers);
brokenTokenMatrix(invokers);

// Items 9–10 of the hardening issue: who reads which compound, and whose import jobs. People: a
// viewer of campaign A (a partner lab), a chemist of A (registry role), an assay scientist of
// campaign B, an admin, and a stranger (signed in, member of nothing). X is on A's plate map, Y on
// B's hit list, Z in no campaign. Rule owner: src/server/auth/compound-access.ts (product design,
// roles table: chemists register compounds for every campaign; viewers read their campaigns).
describe("registry reads and import jobs: who sees what", () => {
  afterAll(() => stopBoss());
  type Who = "viewerA" | "chemist" | "assayB" | "admin" | "stranger";
  const ids = { x: "", y: "", z: "" };
  let w: World;
  let people: Record<Who, TestUser>;
  let tag = "";
  let otherChemist: TestUser;
  beforeAll(async () => {
    w = await makeWorld();
    tag = w.tag;
    const assayB = await newTestUser(`assay-b-${tag}`);
    const stranger = await newTestUser(`stranger-${tag}`);
    otherChemist = await newTestUser(`chemist-b-${tag}`);
    await db.insert(memberships).values([
      { campaignId: w.otherCampaignId, userId: assayB.id, role: "assay" },
      { campaignId: w.otherCampaignId, userId: otherChemist.id, role: "chemist" },
    ]);
    people = { viewerA: w.people.viewer, chemist: w.people.chemist, assayB, admin: w.people.admin, stranger };
    const admin = { ...w.people.admin, globalRole: "admin" as const };
    for (const k of ["x", "y", "z"] as const) {
      const r = await registerCompound(admin, {
        smiles: uniqueSmiles(),
        name: `Access ${k} ${tag} (invented)`,
        batch: { supplier: "Invented Supplier" },
        stock: { concentrationMm: 10, solvent: "DMSO", volumeUl: 100 },
      });
      ids[k] = r.registryId;
    }
    await db.insert(plateMaps).values({
      campaignId: w.campaignId,
      name: `Access map ${tag} (invented)`,
      format: 96,
      wells: [{ well: "A1", role: "sample", compound: ids.x, concentrationUm: 10 }],
      sampleWells: 1,
      neutralWells: 0,
      fullWells: 0,
    });
    const [y] = await db.select().from(compounds).where(eq(compounds.registryId, ids.y));
    await db
      .insert(hitRows)
      .values({ campaignId: w.otherCampaignId, compoundId: ids.y, structureKey: y!.structureKey });
  });

  const sees: Record<Who, ("x" | "y" | "z")[]> = {
    viewerA: ["x"],
    chemist: ["x", "y", "z"],
    assayB: ["y"],
    admin: ["x", "y", "z"],
    stranger: [],
  };

  for (const who of Object.keys(sees) as Who[]) {
    it(`${who}: the compound page (with batches and stocks) answers for ${sees[who].join(", ") || "none"} and 404 otherwise`, async () => {
      for (const k of ["x", "y", "z"] as const) {
        const r = await callRoute(compoundRoute.GET, {
          user: people[who],
          path: `/api/compounds/${ids[k]}`,
          params: { registryId: ids[k] },
        });
        if (sees[who].includes(k)) {
          expect(r.status, `${who} reads ${k}`).toBe(200);
          const j = r.json as { batches: unknown[]; stocks: unknown[] };
          expect(j.batches).toHaveLength(1);
          expect(j.stocks).toHaveLength(1);
        } else {
          expect(r.status, `${who} must not see ${k}`).toBe(404);
          expect((r.json as { error: string }).error).toBe(`No compound ${ids[k]} in the registry.`);
        }
      }
    });

    it(`${who}: list, text search and substructure search give only ${sees[who].join(", ") || "nothing"}`, async () => {
      const want = sees[who].map((k) => ids[k]).sort();
      for (const qs of [
        `q=${encodeURIComponent(`Access`)}%20&limit=200`,
        `q=${tag}&limit=200`,
        `q=${tag}&substructure=${encodeURIComponent("c1ccc(cc1)C(=O)NC")}&limit=200`,
      ]) {
        const r = await callRoute(compoundsRoute.GET, { user: people[who], path: `/api/compounds?${qs}` });
        expect(r.status).toBe(200);
        const got = (r.json as { items: { registryId: string }[] }).items.map((i) => i.registryId);
        const mine = got.filter((id) => Object.values(ids).includes(id)).sort();
        if (qs.startsWith(`q=${tag}`)) expect(mine, qs).toEqual(want);
        else
          expect(
            mine.filter((id) => !want.includes(id)),
            qs,
          ).toEqual([]);
      }
    });
  }

  it("the campaign-scoped drawing: B's members get Y's; A's members get 404 for B's route and for Y on A's route", async () => {
    const call = (user: TestUser, campaignId: string, registryId: string) =>
      callRoute(hitStructureRoute.GET, {
        user,
        path: `/api/campaigns/${campaignId}/hits/${registryId}/structure`,
        params: { campaignId, registryId },
      });
    const ok = await call(people.assayB, w.otherCampaignId, ids.y);
    expect(ok.status).toBe(200);
    expect(ok.response.headers.get("content-type")).toContain("image/svg+xml");
    expect(ok.response.headers.get("etag")).toMatch(/^"[\w-]+"$/);
    expect(ok.json as string).toMatch(/^<svg/);
    expect((await call(people.viewerA, w.otherCampaignId, ids.y)).status).toBe(404);
    expect((await call(people.viewerA, w.campaignId, ids.y)).status).toBe(404);
    expect((await call(people.stranger, w.otherCampaignId, ids.y)).status).toBe(404);
  });

  it("import jobs: the uploader and admins read, report and commit; another chemist and a viewer get 404", async () => {
    const { job, done } = await startImport(w.people.chemist, {
      fileName: `access-${tag}.csv`,
      contentType: "text/csv",
      bytes: new TextEncoder().encode(`smiles,name\n${uniqueSmiles()},Import ${tag} (invented)\n`),
    });
    await done;
    const path = `/api/compound-imports/${job.id}`;
    const params = { importId: job.id };
    const read = (user: TestUser) => callRoute(compoundImportRoute.GET, { user, path, params });
    const report = (user: TestUser) => callRoute(compoundImportReport.GET, { user, path: `${path}/report`, params });
    const commit = (user: TestUser) =>
      callRoute(compoundImportCommit.POST, {
        user,
        method: "POST",
        path: `${path}/commit`,
        params,
        body: { mode: "valid_only" },
      });
    for (const u of [otherChemist, people.viewerA, people.stranger]) {
      expect((await read(u)).status).toBe(404);
      expect((await report(u)).status).toBe(404);
    }
    expect((await commit(otherChemist)).status).toBe(404);
    expect((await read(people.admin)).status).toBe(200);
    expect((await report(people.admin)).status).toBe(200);
    const r = await read(people.chemist);
    expect(r.status).toBe(200);
    expect((r.json as { status: string }).status).toBe("ready");
    const c = await commit(people.chemist);
    expect(c.status).toBe(200);
    expect((c.json as { result: { registered: number } }).result.registered).toBe(1);
    expect((await report(people.chemist)).status).toBe(200);

    // An administrator may commit an import someone else uploaded.
    const second = await startImport(w.people.chemist, {
      fileName: `access-2-${tag}.csv`,
      contentType: "text/csv",
      bytes: new TextEncoder().encode(`smiles,name\n${uniqueSmiles()},Import 2 ${tag} (invented)\n`),
    });
    await second.done;
    const byAdmin = await callRoute(compoundImportCommit.POST, {
      user: people.admin,
      method: "POST",
      path: `/api/compound-imports/${second.job.id}/commit`,
      params: { importId: second.job.id },
      body: { mode: "valid_only" },
    });
    expect(byAdmin.status).toBe(200);
  });
});
