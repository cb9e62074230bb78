/**
 * Roles and what each may do, from the product design. Shared by the server (which enforces)
 * and the UI (which only hides what would be refused anyway).
 */
export const campaignRoles = ["lead", "chemist", "assay", "viewer"] as const;
export type CampaignRole = (typeof campaignRoles)[number];
export const globalRoles = ["admin", "member"] as const;
export type GlobalRole = (typeof globalRoles)[number];

export const roleLabels: Record<CampaignRole, string> = {
  lead: "Project lead",
  chemist: "Chemist",
  assay: "Assay scientist",
  viewer: "Viewer",
};

export type Capability =
  | "campaign:read"
  | "campaign:comment"
  | "compound:write"
  | "plate:write"
  | "analysis:run"
  | "analysis:override"
  | "triage:write"
  | "campaign:settings"
  | "digest:send"
  | "team:manage";

const caps: Record<CampaignRole, readonly Capability[]> = {
  lead: [
    "campaign:read",
    "campaign:comment",
    "analysis:run",
    "analysis:override",
    "triage:write",
    "campaign:settings",
    "digest:send",
  ],
  chemist: ["campaign:read", "campaign:comment", "compound:write"],
  assay: ["campaign:read", "campaign:comment", "plate:write", "analysis:run", "analysis:override"],
  viewer: ["campaign:read"],
};

/** Admins may do everything; a member may do what their role in that campaign allows. */
export function can(globalRole: GlobalRole, role: CampaignRole | null, cap: Capability): boolean {
  if (globalRole === "admin") return true;
  return role !== null && caps[role].includes(cap);
}
