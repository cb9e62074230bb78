import Link from "next/link";
import { sql } from "drizzle-orm";
import { db } from "@/server/db/client";
import { users } from "@/server/db/schema";
import { findInvitation } from "@/server/services/accounts";
import { roleLabels } from "@/lib/roles";
import { AcceptInviteForm } from "../../_components/auth-forms";
import { acceptInviteAction } from "../../actions";

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
  const existing = await db.query.users.findFirst({
    where: sql`lower(${users.email}) = ${found.inv.email.toLowerCase()}`,
  });
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-lg">Join {found.campaignName}</h1>
      <p className="text-sm text-ink-muted">
        You are invited as <b className="text-ink">{roleLabels[found.inv.role]}</b> with the address {found.inv.email}.
      </p>
      <AcceptInviteForm action={acceptInviteAction} token={token} existing={Boolean(existing)} />
    </div>
  );
}
