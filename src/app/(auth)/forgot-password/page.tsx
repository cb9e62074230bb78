import { ForgotForm } from "../_components/auth-forms";
import { requestResetAction } from "../actions";

export const metadata = { title: "Reset password" };

export default function ForgotPage() {
  return <ForgotForm action={requestResetAction} />;
}
