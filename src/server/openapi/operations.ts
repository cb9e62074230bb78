import "server-only";
import type { ApiOperation } from "./types";
import * as compounds from "@/app/api/compounds/schema";
import * as compound from "@/app/api/compounds/[registryId]/schema";
import * as imports from "@/app/api/compound-imports/schema";
import * as importOne from "@/app/api/compound-imports/[importId]/schema";
import * as importCommit from "@/app/api/compound-imports/[importId]/commit/schema";
import * as importReport from "@/app/api/compound-imports/[importId]/report/schema";
import * as plateMaps from "@/app/api/campaigns/[campaignId]/plate-maps/schema";
import * as plateRuns from "@/app/api/campaigns/[campaignId]/plate-runs/schema";
import * as plateRunPreview from "@/app/api/campaigns/[campaignId]/plate-runs/preview/schema";
import * as plateRun from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/schema";
import * as plateRunFile from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/schema";
import * as experiments from "@/app/api/campaigns/[campaignId]/experiments/schema";
import * as hits from "@/app/api/campaigns/[campaignId]/hits/schema";
import * as hit from "@/app/api/campaigns/[campaignId]/hits/[registryId]/schema";
import * as hitExport from "@/app/api/campaigns/[campaignId]/hits/export/schema";
import * as hitViews from "@/app/api/campaigns/[campaignId]/hits/views/schema";
import * as digest from "@/app/api/campaigns/[campaignId]/digest/schema";
import * as audit from "@/app/api/audit/schema";
import * as campaignsSchema from "@/app/api/campaigns/schema";
import * as thresholds from "@/app/api/campaigns/[campaignId]/thresholds/schema";
import * as members from "@/app/api/campaigns/[campaignId]/members/schema";
import * as plateMap from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/schema";
import * as plateMapCopy from "@/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/copy/schema";
import * as decision from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/decision/schema";
import * as masks from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/schema";
import * as mask from "@/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/[well]/schema";
import * as experiment from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/schema";
import * as override from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/override/schema";
import * as plan from "@/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/plan/schema";
import * as batches from "@/app/api/compounds/[registryId]/batches/schema";
import * as stocks from "@/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/schema";
import * as libraries from "@/app/api/libraries/schema";
import * as libraryMembers from "@/app/api/libraries/[libraryId]/members/schema";
import * as myDigest from "@/app/api/me/digest/schema";
import * as tokens from "@/app/api/tokens/schema";
import * as plateBatches from "@/app/api/campaigns/[campaignId]/plate-batches/schema";
import * as plateBatch from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/schema";
import * as acceptPassing from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/accept-passing/schema";
import * as assignFile from "@/app/api/campaigns/[campaignId]/plate-batches/[batchId]/files/[fileId]/assign/schema";

const ok = (description: string, contentType?: string) => ({ description, ...(contentType ? { contentType } : {}) });

/**
 * Every API route handler, in the order the reference page lists them. Adding a route: add it to
 * the registry and here, with the request schemas imported from its own schema.ts; the document
 * test fails until both agree.
 */
export const apiOperations: ApiOperation[] = [
  // Service and account
  {
    method: "GET",
    path: "/api/health",
    summary: "Whether the database, storage, mail and worker answer",
    auth: "public",
    responses: { 200: ok("Every service answers."), 503: ok("At least one service does not answer.") },
  },
  {
    method: "GET",
    path: "/api/openapi.json",
    summary: "This API document (OpenAPI 3.1)",
    auth: "public",
    responses: { 200: ok("The document.") },
  },
  {
    method: "GET",
    path: "/api/me",
    summary: "The signed-in person and their campaign memberships",
    responses: { 200: ok("The person, global role and memberships.") },
  },
  {
    method: "GET",
    path: "/api/campaigns",
    summary: "Campaigns the caller belongs to (all, for an admin)",
    responses: { 200: ok("`items`: the campaigns with the caller's role in each.") },
  },
  {
    method: "GET",
    path: "/api/tokens",
    summary: "My personal API tokens, newest first (never their secrets)",
    responses: { 200: { description: "The tokens.", schema: tokens.GetTokensResponse } },
  },
  {
    method: "POST",
    path: "/api/tokens",
    summary: "Create a personal API token (the secret is in this answer only)",
    body: { schema: tokens.PostTokensBody, kind: "json" },
    responses: {
      201: { description: "The token; keep `token` now, it is not shown again.", schema: tokens.PostTokensResponse },
    },
  },
  {
    method: "DELETE",
    path: "/api/tokens/{tokenId}",
    summary: "Revoke one of my tokens, at once",
    responses: { 200: { description: "When it was revoked.", schema: tokens.DeleteTokenResponse } },
  },
  {
    method: "GET",
    path: "/api/me/digest",
    summary: "Whether I receive each of my campaigns' weekly digest",
    responses: { 200: { description: "One per campaign of mine.", schema: myDigest.GetMyDigestResponse } },
  },
  {
    method: "PUT",
    path: "/api/me/digest",
    summary: "Stop or resume my own digest of one campaign",
    body: { schema: myDigest.PutMyDigestBody, kind: "json" },
    responses: { 200: { description: "The new setting.", schema: myDigest.PutMyDigestResponse } },
  },
  // Campaigns
  {
    method: "POST",
    path: "/api/campaigns",
    summary: "Create a campaign",
    body: { schema: campaignsSchema.PostCampaignBody, kind: "json" },
    responses: {
      201: { description: "The campaign; members are then invited.", schema: campaignsSchema.PostCampaignResponse },
    },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/thresholds",
    summary: "The campaign's QC and hit thresholds",
    responses: { 200: { description: "The thresholds.", schema: thresholds.ThresholdsResponse } },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/thresholds",
    summary: "Change the QC and hit thresholds (fields left out keep their value)",
    body: { schema: thresholds.PatchThresholdsBody, kind: "json", example: { qcMinZPrime: 0.5, hitThresholdPct: 50 } },
    responses: { 200: { description: "The thresholds after the change.", schema: thresholds.ThresholdsResponse } },
  },
  // Team
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/members",
    summary: "The campaign's team (e-mails and invitations for leads and admins only)",
    responses: { 200: ok("`items` (members) and `invitations`.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/members",
    summary: "Invite a person by e-mail (one-time link, valid 72 hours)",
    body: { schema: members.PostMemberBody, kind: "json" },
    responses: {
      201: { description: "The invitation; the link goes only to the invitee.", schema: members.PostMemberResponse },
    },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/members/{userId}",
    summary: "Change a member's role",
    params: members.memberParams,
    body: { schema: members.PatchMemberBody, kind: "json" },
    responses: { 200: { description: "`userId` and the new `role`.", schema: members.PatchMemberResponse } },
  },
  {
    method: "DELETE",
    path: "/api/campaigns/{campaignId}/members/{userId}",
    summary: "Remove a member (their sessions end)",
    params: members.memberParams,
    responses: { 200: ok("`userId`, `removed: true`.") },
  },
  // Audit log
  {
    method: "GET",
    path: "/api/audit",
    summary: "The audit log, newest first, with the values before and after",
    query: audit.GetAuditQuery,
    responses: { 200: { description: "`items` and `total` of every matching row.", schema: audit.GetAuditResponse } },
  },
  // Compound registry
  {
    method: "GET",
    path: "/api/compounds",
    summary: "Search the compound registry (text, substructure, properties)",
    query: compounds.searchQuery,
    responses: { 200: ok("`items`, `total`, `limit`, `offset` and `units` of the property columns.") },
  },
  {
    method: "POST",
    path: "/api/compounds",
    summary: "Register a compound, optionally with its first batch and stock",
    body: {
      schema: compounds.registerBody,
      kind: "json",
      example: { smiles: "CC(=O)Nc1ccc(O)cc1", name: "invented-1" },
    },
    responses: { 201: ok("The registry ID and whether the structure was already registered.") },
  },
  {
    method: "GET",
    path: "/api/compounds/{registryId}",
    summary: "One compound: structure, properties, batches, stocks and results",
    params: compound.registryIdParam,
    responses: { 200: ok("The compound.") },
  },
  {
    method: "PATCH",
    path: "/api/compounds/{registryId}",
    summary: "Edit a compound's structure (with a reason) and/or names",
    params: compound.registryIdParam,
    body: { schema: compound.PatchCompoundBody, kind: "json", example: { name: "invented-1 (renamed)" } },
    responses: {
      200: ok("The compound, as GET gives it."),
      409: ok("The new structure is registered under another ID."),
    },
  },
  {
    method: "GET",
    path: "/api/compounds/{registryId}/batches",
    summary: "A compound's batches, each with its stock solutions",
    params: compound.registryIdParam,
    responses: { 200: ok("`items`: batches with `stocks`.") },
  },
  {
    method: "POST",
    path: "/api/compounds/{registryId}/batches",
    summary: "Add a batch (numbered next), optionally with a stock solution",
    params: compound.registryIdParam,
    body: { schema: batches.PostBatchBody, kind: "json" },
    responses: { 201: { description: "`registryId` and the new `batchNumber`.", schema: batches.PostBatchResponse } },
  },
  {
    method: "GET",
    path: "/api/compounds/{registryId}/batches/{batchNumber}/stocks",
    summary: "The stock solutions made from one batch",
    params: stocks.stocksParams,
    responses: { 200: ok("`items`: stocks (concentration in mM, volume in µL).") },
  },
  {
    method: "POST",
    path: "/api/compounds/{registryId}/batches/{batchNumber}/stocks",
    summary: "Record a stock solution made from one batch",
    params: stocks.stocksParams,
    body: {
      schema: stocks.PostStockBody,
      kind: "json",
      example: { concentrationMm: 10, solvent: "DMSO", volumeUl: 100 },
    },
    responses: { 201: { description: "The new stock.", schema: stocks.PostStockResponse } },
  },
  // Libraries
  {
    method: "GET",
    path: "/api/libraries",
    summary: "Every compound library, with the number of members the caller may see",
    responses: { 200: ok("`items`: libraries.") },
  },
  {
    method: "POST",
    path: "/api/libraries",
    summary: "Create a library, optionally with members (all found or nothing)",
    body: { schema: libraries.PostLibraryBody, kind: "json" },
    responses: { 201: { description: "The library.", schema: libraries.PostLibraryResponse } },
  },
  {
    method: "GET",
    path: "/api/libraries/{libraryId}",
    summary: "One library with the members the caller may see",
    responses: { 200: ok("The library and its members in registry order.") },
  },
  {
    method: "POST",
    path: "/api/libraries/{libraryId}/members",
    summary: "Add compounds to a library by registry ID (one unknown ID refuses all)",
    body: { schema: libraryMembers.PostLibraryMembersBody, kind: "json" },
    responses: {
      200: {
        description: "`added`, and `already` (members before).",
        schema: libraryMembers.PostLibraryMembersResponse,
      },
    },
  },
  {
    method: "DELETE",
    path: "/api/libraries/{libraryId}/members/{registryId}",
    summary: "Take one compound out of a library",
    responses: { 200: ok("`libraryId`, `registryId`, `removed: true`.") },
  },
  {
    method: "POST",
    path: "/api/compound-imports",
    summary: "Upload a compound file (CSV, XLSX or SDF) to validate before it is committed",
    body: { schema: imports.importUploadForm, kind: "multipart" },
    responses: { 202: ok("The import job; poll it until it is `ready`.") },
  },
  {
    method: "GET",
    path: "/api/compound-imports/{importId}",
    summary: "An import job: progress, counts and the first problems",
    params: importOne.importIdParam,
    responses: { 200: ok("The import job.") },
  },
  {
    method: "POST",
    path: "/api/compound-imports/{importId}/commit",
    summary: "Commit a validated import",
    params: importOne.importIdParam,
    body: { schema: importCommit.commitBody, kind: "json" },
    responses: { 200: ok("The import job after committing.") },
  },
  {
    method: "GET",
    path: "/api/compound-imports/{importId}/report",
    summary: "Every record's outcome as CSV",
    params: importReport.importIdParam,
    responses: { 200: ok("One line per record.", "text/csv") },
  },
  // Plate maps and plate runs
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-maps",
    summary: "List the campaign's plate maps",
    responses: { 200: ok("`items`: the plate maps.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-maps",
    summary: "Import a plate map from CSV",
    body: {
      schema: plateMaps.createPlateMapForm,
      kind: "multipart",
      example: { name: "invented map", format: "384", file: "(file)" },
    },
    responses: { 201: ok("`id` of the new plate map.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-maps/{plateMapId}",
    summary: "One plate map with its layout",
    responses: { 200: { description: "The plate map.", schema: plateMap.GetPlateMapResponse } },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/plate-maps/{plateMapId}",
    summary: "Change a plate map no run uses yet",
    body: { schema: plateMap.PatchPlateMapBody, kind: "json", example: { name: "invented map v2" } },
    responses: {
      200: { description: "The plate map after the change.", schema: plateMap.GetPlateMapResponse },
      409: ok("Runs use it: copy it instead."),
    },
  },
  {
    method: "DELETE",
    path: "/api/campaigns/{campaignId}/plate-maps/{plateMapId}",
    summary: "Delete a plate map no run uses",
    responses: { 204: ok("Deleted."), 409: ok("Runs use it.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-maps/{plateMapId}/copy",
    summary: "Copy a plate map as a template under a new name",
    body: { schema: plateMapCopy.PostPlateMapCopyBody, kind: "json" },
    responses: { 201: ok("`id` of the copy."), 409: ok("The name is taken.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-runs",
    summary: "List plate runs with their QC",
    responses: { 200: ok("`items`: runs with Z′, signal window and verdict.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-runs",
    summary: "Upload a reader export as a plate run",
    body: { schema: plateRuns.uploadRunForm, kind: "multipart" },
    responses: { 201: ok("The stored run with its QC.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-runs/preview",
    summary: "Parse a reader export and show its QC without storing it",
    body: { schema: plateRunPreview.uploadRunForm, kind: "multipart" },
    responses: { 200: ok("The parsed plate and its QC.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-batches",
    summary: "Upload a day's plates at once: many files or one zip, optional manifest",
    description:
      "Each file is stored with its SHA-256 and parsed on its own; one bad or duplicate file does not stop the others. " +
      "Without a manifest the plate map is matched by the barcode in the file name or the export's header.",
    query: plateBatches.PostPlateBatchQuery,
    body: { schema: plateBatches.PostPlateBatchForm, kind: "multipart" },
    responses: {
      201: { description: "`?wait=true`: every file's outcome.", schema: plateBatches.PlateBatchResponse },
      202: { description: "The batch while its files are parsed; poll GET.", schema: plateBatches.PlateBatchResponse },
    },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-batches/{batchId}",
    summary: "A plate batch: each file's outcome and the runs' QC",
    responses: { 200: { description: "The batch.", schema: plateBatch.GetPlateBatchResponse } },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-batches/{batchId}/accept-passing",
    summary: "Accept every undecided run of the batch that passes QC, with one reason",
    body: { schema: acceptPassing.PostAcceptPassingBody, kind: "json" },
    responses: {
      200: { description: "The runs accepted and those left.", schema: acceptPassing.PostAcceptPassingResponse },
    },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-batches/{batchId}/files/{fileId}/assign",
    summary: "Give an unmatched or refused file its plate map and upload it",
    body: { schema: assignFile.PostAssignBatchFileBody, kind: "json" },
    responses: { 200: { description: "The file's new outcome.", schema: assignFile.PostAssignBatchFileResponse } },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-runs/{runId}",
    summary: "One plate run: wells, QC, masks and decision",
    params: plateRun.runParams,
    responses: { 200: ok("The run.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/plate-runs/{runId}/file",
    summary: "The reader export as uploaded",
    params: plateRunFile.runParams,
    responses: { 200: ok("The stored bytes, with the uploaded file's content type.", "application/octet-stream") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-runs/{runId}/decision",
    summary: "Accept or reject a plate run (a run failing QC cannot be accepted)",
    body: { schema: decision.PostDecisionBody, kind: "json" },
    responses: {
      200: { description: "The decision.", schema: decision.PostDecisionResponse },
      409: ok("The run fails QC: mask the wells at fault, or reject it."),
    },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/plate-runs/{runId}/masks",
    summary: "Mask wells with one reason (all or nothing; QC recomputed)",
    body: { schema: masks.PostMasksBody, kind: "json" },
    responses: {
      200: { description: "The masks and the recomputed QC.", schema: masks.MasksResponse },
      409: ok("A well is masked already."),
    },
  },
  {
    method: "DELETE",
    path: "/api/campaigns/{campaignId}/plate-runs/{runId}/masks/{well}",
    summary: "Unmask one well with a reason (QC recomputed)",
    body: { schema: mask.DeleteMaskBody, kind: "json" },
    responses: {
      200: { description: "The masks and the recomputed QC.", schema: mask.DeleteMaskResponse },
      409: ok("The well is not masked."),
    },
  },
  // Experiments and analyses
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/experiments",
    summary: "List the campaign's experiments",
    responses: { 200: ok("`items`: experiments with their latest analysis.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/experiments",
    summary: "Create an experiment from accepted plate runs",
    body: { schema: experiments.postBody, kind: "json" },
    responses: { 201: ok("`id` of the new experiment.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/analyses",
    summary: "Request an analysis (queued; an identical earlier one is reused)",
    responses: { 202: ok("`id`, `status` and `reused`.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/analyses/{analysisId}",
    summary: "An analysis: status, engine version and failure reason",
    responses: { 200: ok("The analysis.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/analyses/{analysisId}/retry",
    summary: "Retry a failed analysis",
    responses: { 202: ok("The analysis, queued again.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/results",
    summary: "Per-compound results of the experiment's latest analysis",
    responses: { 200: ok("One result per compound (IC50 in µM, Ki in µM, mechanism, flags).") },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}",
    summary: "Change an experiment's plate runs and/or settings",
    body: {
      schema: experiment.PatchExperimentBody,
      kind: "json",
      example: { runIds: ["0b4f7c7e-3a51-4c2e-9d7a-5f1e2b3c4d5e"] },
    },
    responses: { 200: { description: "The experiment after the change.", schema: experiment.PatchExperimentResponse } },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/results/{registryId}/override",
    summary: "Override the mechanism call of one compound in a mechanism study",
    body: { schema: override.PostOverrideBody, kind: "json" },
    responses: { 201: { description: "The override.", schema: override.PostOverrideResponse } },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/experiments/{experimentId}/results/{registryId}/plan",
    summary: "Plan a mechanism study for a compound and save it as a plate map",
    body: { schema: plan.PostPlanBody, kind: "json" },
    responses: { 201: { description: "The new plate map's id and layout.", schema: plan.PostPlanResponse } },
  },
  // Hits
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/hits",
    summary: "The hit grid: filtered, sorted, paged",
    query: hits.listQuery,
    responses: { 200: ok("`items`, `total` and the units of each column.") },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/hits",
    summary: "Set the triage status of many hits",
    body: { schema: hits.bulkBody, kind: "json" },
    responses: { 200: ok("How many changed.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/hits/export",
    summary: "Export the filtered hit grid as CSV or XLSX",
    query: hitExport.exportQuery,
    responses: { 200: ok("The file (text/csv or XLSX).", "text/csv") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/hits/{registryId}",
    summary: "One hit: results across experiments, triage history, comments",
    responses: { 200: ok("The hit.") },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/hits/{registryId}",
    summary: "Set one hit's triage status",
    body: { schema: hit.patchBody, kind: "json" },
    responses: { 200: ok("`registryId`, `status`, `changed`.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/hits/{registryId}/comments",
    summary: "Comment on a hit",
    body: { schema: hit.commentBody, kind: "json" },
    responses: { 201: ok("The comment.") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/hits/{registryId}/structure",
    summary: "The hit's structure drawing",
    responses: { 200: ok("SVG drawing.", "image/svg+xml"), 304: ok("Not modified (ETag).") },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/hits/views",
    summary: "The caller's saved grid views",
    responses: { 200: ok("`items`: the views.") },
  },
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/hits/views",
    summary: "Save a grid view",
    body: { schema: hitViews.postBody, kind: "json" },
    responses: { 201: ok("The saved view.") },
  },
  {
    method: "DELETE",
    path: "/api/campaigns/{campaignId}/hits/views/{viewId}",
    summary: "Delete one of the caller's saved views",
    responses: { 200: ok("`ok: true`.") },
  },
  // Digest
  {
    method: "POST",
    path: "/api/campaigns/{campaignId}/digest",
    summary: "Send the weekly digest now, or preview it",
    body: { schema: digest.postBody, kind: "json" },
    responses: { 200: ok("The preview (`subject`, `html`, `text`) or the send summary.") },
  },
  {
    method: "PATCH",
    path: "/api/campaigns/{campaignId}/digest",
    summary: "Set when the weekly digest goes out (weekday, local hour, time zone)",
    body: {
      schema: digest.PatchDigestBody,
      kind: "json",
      example: { digestWeekday: 1, digestHour: 7, timeZone: "Europe/Berlin" },
    },
    responses: { 200: { description: "The whole schedule.", schema: digest.DigestScheduleResponse } },
  },
  {
    method: "GET",
    path: "/api/campaigns/{campaignId}/digest/log",
    summary: "Recent digest sends and their outcome",
    responses: { 200: ok("`items`: sends.") },
  },
];
