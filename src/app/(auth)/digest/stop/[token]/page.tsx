import { OPT_OUT_LINK_DAYS, stopLinkTarget } from "@/server/services/digest";
import { StopDigestForm } from "./stop-form";
import { stopDigestAction } from "../../actions";

// Rendered per request: a page kept from an earlier request would carry that request's CSP nonce (src/proxy.ts).
export const dynamic = "force-dynamic";

export const metadata = { title: "Stop the weekly digest" };

export default async function StopDigestPage({ params }: { params: Promise<{ token: string }> }) {
  const { token: param } = await params;
  // A malformed escape (e.g. "%E0") is simply a link that is not valid, not an error page.
  let token = "";
  try {
    token = decodeURIComponent(param);
  } catch {}
  const target = token.length > 0 && token.length <= 600 ? await stopLinkTarget(token) : null;
  if (!target) {
    return (
      <div className="flex flex-col gap-2">
        <h1 className="text-lg">This link is not valid</h1>
        <p className="text-sm text-ink-muted">
          It may be altered, older than {OPT_OUT_LINK_DAYS} days, or for a campaign you have left. Open it from a recent
          digest e-mail, or stop the digest in your settings after signing in.
        </p>
      </div>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      <h1 className="text-lg">Stop the weekly digest</h1>
      <p className="text-sm text-ink-muted">
        Campaign {target.campaignName}: the person this link was sent to will no longer receive its weekly digest. Other
        campaigns&rsquo; digests are not affected.
      </p>
      <StopDigestForm action={stopDigestAction} token={token} />
    </div>
  );
}
