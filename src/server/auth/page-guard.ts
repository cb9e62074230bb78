import "server-only";
import { notFound, redirect } from "next/navigation";
import { AppError } from "@/server/errors";
import { requireAdmin, requireCampaign, requireUser } from "./guard";
import { checkParams } from "@/server/edge-input";
import type { Capability } from "@/lib/roles";

// Pages use the same guard, but answer like pages: signed out → the sign-in page; not a member
// or not allowed → 404 (a campaign's existence is not revealed).
function asPage(e: unknown): never {
  if (e instanceof AppError) {
    if (e.code === "unauthorized") redirect("/sign-in");
    // A malformed address (a bad UUID or registry ID reaching the database) is a page that does not exist.
    if (e.code === "not_found" || e.code === "forbidden" || e.code === "bad_request") notFound();
  }
  throw e;
}

export const pageUser = () => requireUser().catch(asPage);
export const pageAdmin = () => requireAdmin().catch(asPage);
export const pageCampaign = (campaignId: string, cap?: Capability) => requireCampaign(campaignId, cap).catch(asPage);

/**
 * A path parameter a page decodes itself (registry IDs, tokens): decoded once, and a malformed
 * escape such as "%E0" or a value that fails the edge rules (src/server/edge-input.ts) is a page
 * that does not exist, never an error page.
 */
export function pageParam(key: string, raw: string): string {
  let value: string;
  try {
    value = decodeURIComponent(raw);
    checkParams({ [key]: value });
  } catch {
    notFound();
  }
  return value;
}
