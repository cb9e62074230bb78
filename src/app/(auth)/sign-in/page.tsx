import { redirect } from "next/navigation";
import { getCurrentSession } from "@/server/auth/session";
import { SignInForm } from "../_components/auth-forms";
import { signInAction } from "../actions";

export const metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string }> }) {
  const { user } = await getCurrentSession();
  if (user) redirect("/campaigns");
  const { next } = await searchParams;
  return <SignInForm action={signInAction} next={next} />;
}
