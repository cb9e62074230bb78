import { ForgotForm } from "../_components/auth-forms";
import { requestResetAction } from "../actions";

export const dynamic = "force-dynamic"; // a fresh CSP nonce per request (see src/proxy.ts)

export const metadata = { title: "Reset password" };

export default function ForgotPage() {
  return <ForgotForm action={requestResetAction} />;
}
