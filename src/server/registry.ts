/**
 * Every route handler and server action, with who may call it. The role-matrix test
 * (registry.int.test.ts) fails when a route or action exists without an entry here, and calls
 * each entry as every kind of person, asserting allow or deny.
 *
 * Actors: signedOut; nonMember (signed in, member of another campaign only); viewer, chemist,
 * assay, lead (members of the campaign in question); admin (global administrator).
 */
export const allActors = ["signedOut", "nonMember", "viewer", "chemist", "assay", "lead", "admin"] as const;
export type RegistryActor = (typeof allActors)[number];

const everyone = [...allActors];
const signedIn = allActors.filter((a) => a !== "signedOut");
const members = ["viewer", "chemist", "assay", "lead", "admin"] as const;

export type RegistryEntry = {
  /** "<file>#<export>", e.g. "src/app/api/me/route.ts#GET". */
  id: string;
  what: string;
  allow: readonly RegistryActor[];
  /**
   * Route handlers also accept personal API tokens: a read-write token is allowed what its owner
   * is, a read token only on GET. `sessionOnly` routes refuse every token.
   */
  sessionOnly?: true;
};

export const registry: RegistryEntry[] = [
  // Foundation and accounts
  { id: "src/app/api/health/route.ts#GET", what: "service health (public, no data)", allow: everyone },
  // API document: public like health (shapes and roles only, no data)
  { id: "src/app/api/openapi.json/route.ts#GET", what: "the OpenAPI 3.1 document (public, no data)", allow: everyone },
  { id: "src/app/api/me/route.ts#GET", what: "the signed-in user and memberships", allow: signedIn },
  { id: "src/app/api/campaigns/route.ts#GET", what: "campaigns the user belongs to", allow: signedIn },
  { id: "src/app/(auth)/actions.ts#signInAction", what: "sign in (public)", allow: everyone },
  { id: "src/app/(auth)/actions.ts#signOutAction", what: "sign out (public)", allow: everyone },
  { id: "src/app/(auth)/actions.ts#requestResetAction", what: "ask for a reset link (public)", allow: everyone },
  {
    id: "src/app/(auth)/actions.ts#resetPasswordAction",
    what: "set a new password with a token (public)",
    allow: everyone,
  },
  {
    id: "src/app/(auth)/actions.ts#acceptInviteAction",
    what: "accept an invitation with a token (public)",
    allow: everyone,
  },
  {
    id: "src/app/(workspace)/settings/actions.ts#changePasswordAction",
    what: "change one's own password",
    allow: signedIn,
  },
  { id: "src/app/(workspace)/campaigns/actions.ts#createCampaignAction", what: "create a campaign", allow: ["admin"] },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#inviteAction",
    what: "invite a person",
    allow: ["admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#changeRoleAction",
    what: "change a member's role",
    allow: ["admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#removeMemberAction",
    what: "remove a member",
    allow: ["admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/team/actions.ts#updateThresholdsAction",
    what: "set QC and hit thresholds",
    allow: ["lead", "admin"],
  },
  // Plates: members read; assay scientists and admins write
  { id: "src/app/api/campaigns/[campaignId]/plate-maps/route.ts#GET", what: "list plate maps", allow: members },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-maps/route.ts#POST",
    what: "import a plate map from CSV",
    allow: ["assay", "admin"],
  },
  { id: "src/app/api/campaigns/[campaignId]/plate-runs/route.ts#GET", what: "list plate runs with QC", allow: members },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/route.ts#POST",
    what: "upload a reader export",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/preview/route.ts#POST",
    what: "preview a reader export (nothing stored)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/route.ts#GET",
    what: "a plate run with QC and well readings",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/file/route.ts#GET",
    what: "download a run's raw file",
    allow: members,
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#savePlateMapAction",
    what: "save a plate map from the editor",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#maskWellAction",
    what: "mask a well with a reason",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#unmaskWellAction",
    what: "unmask a well with a reason",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/plates/actions.ts#decideRunAction",
    what: "accept or reject a run's QC",
    allow: ["assay", "admin"],
  },
  // Plate runs, plate maps, experiments, overrides and the planner in the JSON API: the same
  // services and capabilities as the pages' actions (members read; writes as the action's entry)
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/decision/route.ts#POST",
    what: "accept or reject a plate run (audited)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/route.ts#POST",
    what: "mask wells of a run with a reason (audited)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-runs/[runId]/masks/[well]/route.ts#DELETE",
    what: "unmask a well with a reason (audited)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#GET",
    what: "one plate map with its layout",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#PATCH",
    what: "change a plate map no run uses",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/route.ts#DELETE",
    what: "delete a plate map no run uses",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-maps/[plateMapId]/copy/route.ts#POST",
    what: "copy a plate map as a template",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/route.ts#PATCH",
    what: "change an experiment's runs or settings (audited)",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/override/route.ts#POST",
    what: "override a mechanism call with a reason (audited)",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/[registryId]/plan/route.ts#POST",
    what: "plan a mechanism study as a new plate map",
    allow: ["assay", "admin"],
  },
  // End of plate runs, plate maps, experiments, overrides and the planner in the JSON API
  // Compounds: not campaign-scoped. Chemists (in any campaign) and admins read the whole registry
  // and write; anyone else reads only compounds of their campaigns (compound-access.ts; outside
  // them 404). The world's compound appears in no campaign, and its imports were uploaded by the
  // admin (only the uploader and admins read or commit an import).
  {
    id: "src/app/api/compounds/route.ts#GET",
    what: "search compounds (ID, name, alias, substructure) among those the reader may see",
    allow: signedIn,
  },
  { id: "src/app/api/compounds/route.ts#POST", what: "register a compound", allow: ["chemist", "admin"] },
  {
    id: "src/app/api/compounds/[registryId]/route.ts#GET",
    what: "a compound with batches, stocks, libraries (registry role, or in a campaign of the reader)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compound-imports/route.ts#POST",
    what: "upload a bulk-import file (stored, then prepared)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compound-imports/[importId]/route.ts#GET",
    what: "an import's progress and preview (uploader and admins)",
    allow: ["admin"],
  },
  {
    id: "src/app/api/compound-imports/[importId]/commit/route.ts#POST",
    what: "register an import (chosen mode, one transaction; uploader and admins)",
    allow: ["admin"],
  },
  {
    id: "src/app/api/compound-imports/[importId]/report/route.ts#GET",
    what: "download an import's report (CSV; uploader and admins)",
    allow: ["admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#registerCompoundAction",
    what: "register a compound from the form",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#addBatchAction",
    what: "add a batch to a compound",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#addStockAction",
    what: "record a stock solution",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#editCompoundAction",
    what: "edit names or the structure (audited)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#createLibraryAction",
    what: "create a library (optionally from pasted IDs)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#addToLibraryAction",
    what: "add compounds to a library by ID",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/(workspace)/compounds/actions.ts#removeFromLibraryAction",
    what: "remove a compound from a library",
    allow: ["chemist", "admin"],
  },
  // Analyses: members read; assay scientists, leads and admins run analyses
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/route.ts#GET",
    what: "list experiments with their latest analysis",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/route.ts#POST",
    what: "create an experiment from plate runs",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/route.ts#POST",
    what: "start an analysis (background)",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/route.ts#GET",
    what: "an analysis's status, progress and provenance",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/analyses/[analysisId]/retry/route.ts#POST",
    what: "retry a failed analysis (same inputs, audited)",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/experiments/[experimentId]/results/route.ts#GET",
    what: "current results, one per compound",
    allow: members,
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#createExperimentAction",
    what: "create an experiment from the form",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#startAnalysisAction",
    what: "start an analysis from the page",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#overrideMechanismAction",
    what: "override a mechanism call with a reason (audited)",
    allow: ["assay", "lead", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#saveCurationAction",
    what: "exclude or restore a result's wells as audited well masks (one transaction)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/analyses/actions.ts#planMechanismPlateAction",
    what: "turn a mechanism-study plan into a plate map",
    allow: ["assay", "admin"],
  },
  // Hit triage: members read, export and keep their own views; leads and admins set the triage status; everyone but viewers comments
  {
    id: "src/app/api/campaigns/[campaignId]/hits/route.ts#GET",
    what: "ranked hits, sorted, filtered and paged in Postgres",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/route.ts#PATCH",
    what: "set the triage status of a selection (one transaction, audited)",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/[registryId]/route.ts#GET",
    what: "a compound's panel: results, batches, status history, comments",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/[registryId]/route.ts#PATCH",
    what: "set one compound's triage status (audited)",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/[registryId]/comments/route.ts#POST",
    what: "comment on a compound",
    allow: ["chemist", "assay", "lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/[registryId]/structure/route.ts#GET",
    what: "a compound's structure drawing (SVG)",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/export/route.ts#GET",
    what: "export the current view as XLSX or CSV",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/views/route.ts#GET",
    what: "one's own saved grid views",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/views/route.ts#POST",
    what: "save a named grid view for oneself",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/hits/views/[viewId]/route.ts#DELETE",
    what: "delete one's own saved view",
    allow: members,
  },
  // Weekly digest: leads and admins send and schedule; members stop it for themselves
  {
    id: "src/app/api/campaigns/[campaignId]/digest/route.ts#POST",
    what: "preview or send the weekly digest now",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/digest/log/route.ts#GET",
    what: "the digest send log",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/digest/actions.ts#sendDigestNowAction",
    what: "send this week's digest now",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/(workspace)/campaigns/[campaignId]/digest/actions.ts#setDigestScheduleAction",
    what: "set the digest's weekday, hour and zone",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/(workspace)/settings/actions.ts#setMyDigestAction",
    what: "stop or resume one's own digest of a campaign",
    allow: members,
  },
  {
    id: "src/app/(auth)/digest/actions.ts#stopDigestAction",
    what: "stop the digest from the e-mail's signed link (public)",
    allow: everyone,
  },
  // Personal API tokens: one's own, for anyone signed in; minting needs a browser session
  { id: "src/app/api/tokens/route.ts#GET", what: "one's own API tokens", allow: signedIn },
  {
    id: "src/app/api/tokens/route.ts#POST",
    what: "create an API token (session only)",
    allow: signedIn,
    sessionOnly: true,
  },
  { id: "src/app/api/tokens/[tokenId]/route.ts#DELETE", what: "revoke one's own API token", allow: signedIn },
  // End of personal API tokens
  // Issue 16 (2b), JSON API over the same services as the forms: compounds (batches, stocks,
  // structure edit), libraries, campaigns, thresholds, digest schedule, team, audit, my digest.
  {
    id: "src/app/api/compounds/[registryId]/route.ts#PATCH",
    what: "edit a compound's structure (with a reason) or names (audited)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compounds/[registryId]/batches/route.ts#GET",
    what: "a compound's batches with their stocks (same visibility as the compound)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compounds/[registryId]/batches/route.ts#POST",
    what: "add a batch, optionally with a stock (audited)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/route.ts#GET",
    what: "one batch's stock solutions (same visibility as the compound)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/compounds/[registryId]/batches/[batchNumber]/stocks/route.ts#POST",
    what: "record a stock solution of a batch (audited)",
    allow: ["chemist", "admin"],
  },
  { id: "src/app/api/libraries/route.ts#GET", what: "libraries with visible member counts", allow: signedIn },
  { id: "src/app/api/libraries/route.ts#POST", what: "create a library (audited)", allow: ["chemist", "admin"] },
  {
    id: "src/app/api/libraries/[libraryId]/route.ts#GET",
    what: "a library with the members the reader may see",
    allow: signedIn,
  },
  {
    id: "src/app/api/libraries/[libraryId]/members/route.ts#POST",
    what: "add compounds to a library (one transaction, audited)",
    allow: ["chemist", "admin"],
  },
  {
    id: "src/app/api/libraries/[libraryId]/members/[registryId]/route.ts#DELETE",
    what: "remove a compound from a library (audited)",
    allow: ["chemist", "admin"],
  },
  { id: "src/app/api/campaigns/route.ts#POST", what: "create a campaign (audited)", allow: ["admin"] },
  {
    id: "src/app/api/campaigns/[campaignId]/thresholds/route.ts#GET",
    what: "the QC and hit thresholds",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/thresholds/route.ts#PATCH",
    what: "set QC and hit thresholds (audited)",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/digest/route.ts#PATCH",
    what: "set the digest's weekday, hour and zone (audited)",
    allow: ["lead", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/members/route.ts#GET",
    what: "the team (leads and admins with e-mails and invitations; others names and roles)",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/members/route.ts#POST",
    what: "invite a person (audited)",
    allow: ["admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/members/[userId]/route.ts#PATCH",
    what: "change a member's role (audited)",
    allow: ["admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/members/[userId]/route.ts#DELETE",
    what: "remove a member (audited; their sessions end)",
    allow: ["admin"],
  },
  { id: "src/app/api/audit/route.ts#GET", what: "read the audit log (paged, filtered)", allow: ["admin"] },
  { id: "src/app/api/me/digest/route.ts#GET", what: "my digest setting per campaign", allow: signedIn },
  {
    id: "src/app/api/me/digest/route.ts#PUT",
    what: "stop or resume my digest of a campaign of mine (audited)",
    allow: members,
  },
  // End of issue 16 (2b).
  // Issue 16 (4): a day's plates in one upload.
  {
    id: "src/app/api/campaigns/[campaignId]/plate-batches/route.ts#POST",
    what: "upload a day's plate exports (files or one zip, optional manifest)",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/route.ts#GET",
    what: "a plate batch: each file's outcome and the runs' QC",
    allow: members,
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/files/[fileId]/assign/route.ts#POST",
    what: "give an unmatched batch file its plate map and upload it",
    allow: ["assay", "admin"],
  },
  {
    id: "src/app/api/campaigns/[campaignId]/plate-batches/[batchId]/accept-passing/route.ts#POST",
    what: "accept every undecided run of a batch that passes QC (one reason, audited)",
    allow: ["assay", "admin"],
  },
  // End of issue 16 (4).
];

export const registryGroups = { everyone, signedIn, members };
