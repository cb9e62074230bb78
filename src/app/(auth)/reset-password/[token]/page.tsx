import { NewPasswordForm } from "../../_components/auth-forms";
import { resetPasswordAction } from "../../actions";

// Rendered per request: a page kept from an earlier request would carry that request's CSP nonce (src/proxy.ts).
export const dynamic = "force-dynamic";

export const metadata = { title: "New password" };

export default async function ResetPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return <NewPasswordForm action={resetPasswordAction} token={token} />;
}
