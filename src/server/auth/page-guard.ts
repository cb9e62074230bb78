import "server-only";
import { notFound, redirect } from "next/navigation";
import { AppError } from "@/server/errors";
import { requireAdmin, requireCampaign, requireUser } from "./guard";
import type { Capability } from "@/lib/roles";

// Pages use the same guard, but answer like pages: signed out → the sign-in page; not a member
// or not allowed → 404 (a campaign's existence is not revealed).
function asPage(e: unknown): never {
  if (e instanceof AppError) {
    if (e.code === "unauthorized") redirect("/sign-in");
    if (e.code === "not_found" || e.code === "forbidden") notFound();
  }
  throw e;
}

export const pageUser = () => requireUser().catch(asPage);
export const pageAdmin = () => requireAdmin().catch(asPage);
export const pageCampaign = (campaignId: string, cap?: Capability) => requireCampaign(campaignId, cap).catch(asPage);
