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
    method: "GET",
    path: "/api/campaigns/{campaignId}/digest/log",
    summary: "Recent digest sends and their outcome",
    responses: { 200: ok("`items`: sends.") },
  },
];
