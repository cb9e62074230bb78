import Link from "next/link";
import { findInvitation, hasAccount } from "@/server/services/accounts";
import { roleLabels } from "@/lib/roles";
import { AcceptInviteForm } from "../../_components/auth-forms";
import { acceptInviteAction } from "../../actions";

// Rendered per request: a page kept from an earlier request would carry that request's CSP nonce (src/proxy.ts).
export const dynamic = "force-dynamic";

export const metadata = { title: "Invitation" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const found = await findInvitation(token);
  if (!found) {
    return (
      <div className="flex flex-col gap-2">
        <h1 className="text-lg">This invitation cannot be used</h1>
        <p className="text-sm text-ink-muted">
          It was used already, was withdrawn, or is older than 72 hours. Ask the person who invited you for a new one.
        </p>
        <Link href="/sign-in" className="text-sm">
          Go to sign-in
        </Link>
      </div>
    );
  }
  const existing = await hasAccount(found.inv.email);
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-lg">Join {found.campaignName}</h1>
      <p className="text-sm text-ink-muted">
        You are invited as <b className="text-ink">{roleLabels[found.inv.role]}</b> with the address {found.inv.email}.
      </p>
      <AcceptInviteForm action={acceptInviteAction} token={token} existing={existing} />
    </div>
  );
}
