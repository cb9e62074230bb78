import { stopLinkTarget } from "@/server/services/digest";
import { StopDigestForm } from "./stop-form";
import { stopDigestAction } from "../../actions";

export const metadata = { title: "Stop the weekly digest" };

export default async function StopDigestPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const target = await stopLinkTarget(decodeURIComponent(token));
  if (!target) {
    return (
      <div className="flex flex-col gap-2">
        <h1 className="text-lg">This link is not valid</h1>
        <p className="text-sm text-ink-muted">
          Open it from the digest e-mail, or stop the digest in your settings after signing in.
        </p>
      </div>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-lg">Stop the weekly digest</h1>
      <p className="text-sm text-ink-muted">
        For {target.email ?? "this address"}, campaign {target.campaignName ?? "(removed)"}. Other campaigns&rsquo;
        digests are not affected.
      </p>
      <StopDigestForm action={stopDigestAction} token={decodeURIComponent(token)} />
    </div>
  );
}
