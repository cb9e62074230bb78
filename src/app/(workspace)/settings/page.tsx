import { pageUser } from "@/server/auth/page-guard";
import { PasswordForm } from "./password-form";
import { changePasswordAction } from "./actions";

export const metadata = { title: "Your settings" };

export default async function SettingsPage({ searchParams }: { searchParams: Promise<{ changed?: string }> }) {
  const user = await pageUser();
  const { changed } = await searchParams;
  return (
    <main className="mx-auto w-full max-w-3xl px-6 py-6">
      <h1 className="mb-1">Your settings</h1>
      <p className="mb-5 text-sm text-ink-muted">
        {user.name} · {user.email}
      </p>
      <section>
        <h3 className="mb-2">Password</h3>
        {changed ? <p className="mb-2 rounded bg-pass-soft px-2 py-1.5 text-sm text-pass">Password changed. Every other session was signed out.</p> : null}
        <PasswordForm action={changePasswordAction} />
      </section>
    </main>
  );
}
