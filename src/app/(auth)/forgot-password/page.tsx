import { ForgotForm } from "../_components/auth-forms";
import { requestResetAction } from "../actions";

// Rendered per request: a prerendered page would carry no CSP nonce (src/proxy.ts).
export const dynamic = "force-dynamic";

export const metadata = { title: "Reset password" };

export default function ForgotPage() {
  return <ForgotForm action={requestResetAction} />;
}
