import { eq } from "drizzle-orm";
import { db } from "@/server/db/client";
import { campaigns, users } from "@/server/db/schema";
import { readOptOutToken } from "@/server/services/digest";
import { StopDigestForm } from "./stop-form";
import { stopDigestAction } from "../../actions";

export const metadata = { title: "Stop the weekly digest" };

export default async function StopDigestPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const who = readOptOutToken(decodeURIComponent(token));
  if (!who) {
    return (
      <div className="flex flex-col gap-2">
        <h1 className="text-lg">This link is not valid</h1>
        <p className="text-sm text-ink-muted">
          Open it from the digest e-mail, or stop the digest in your settings after signing in.
        </p>
      </div>
    );
  }
  const [[u], [c]] = await Promise.all([
    db.select({ email: users.email }).from(users).where(eq(users.id, who.userId)),
    db.select({ name: campaigns.name }).from(campaigns).where(eq(campaigns.id, who.campaignId)),
  ]);
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-lg">Stop the weekly digest</h1>
      <p className="text-sm text-ink-muted">
        For {u?.email ?? "this address"}, campaign {c?.name ?? "(removed)"}. Other campaigns&rsquo; digests are not
        affected.
      </p>
      <StopDigestForm action={stopDigestAction} token={decodeURIComponent(token)} />
    </div>
  );
}
