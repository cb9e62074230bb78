import { redirect } from "next/navigation";
import { getCurrentSession } from "@/server/auth/session";
import { safeNextPath } from "@/server/auth/redirect";
import { SignInForm } from "../_components/auth-forms";
import { signInAction } from "../actions";

export const metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { user } = await getCurrentSession();
  const { next } = await searchParams;
  if (user) redirect(safeNextPath(next));
  return <SignInForm action={signInAction} next={next} />;
}
