import { NewPasswordForm } from "../../_components/auth-forms";
import { resetPasswordAction } from "../../actions";

export const metadata = { title: "New password" };

export default async function ResetPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return <NewPasswordForm action={resetPasswordAction} token={token} />;
}
