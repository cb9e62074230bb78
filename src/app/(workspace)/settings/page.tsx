import { pageUser } from "@/server/auth/page-guard";
import { PasswordForm } from "./password-form";
import { changePasswordAction, setMyDigestAction } from "./actions";
import { campaignsFor } from "@/server/services/campaigns";
import { optOutsOf } from "@/server/services/digest";
import { DigestToggle } from "./digest-toggle";
import { TokenPanel } from "./token-panel";

export const metadata = { title: "Your settings" };

export default async function SettingsPage({ searchParams }: { searchParams: Promise<{ changed?: string }> }) {
  const user = await pageUser();
  const { changed } = await searchParams;
  const [mine, stopped] = await Promise.all([campaignsFor(user), optOutsOf(user.id)]);
  const memberOf = mine.filter((c) => c.role !== null);
  return (
    <main className="mx-auto w-full max-w-5xl px-6 py-6">
      <h1 className="mb-1">Your settings</h1>
      <p className="mb-5 text-sm text-ink-muted">
        {user.name} · {user.email}
      </p>
      <section>
        <h3 className="mb-2">Password</h3>
        {changed ? (
          <p className="mb-2 rounded bg-pass-soft px-2 py-1.5 text-sm text-pass">
            Password changed. Every other session was signed out.
          </p>
        ) : null}
        <PasswordForm action={changePasswordAction} />
      </section>
      <section className="mt-8">
        <h3 className="mb-2">Weekly digest</h3>
        {memberOf.length === 0 ? (
          <p className="text-sm text-ink-muted">You are not a member of any campaign.</p>
        ) : (
          <table className="table-dense card max-w-xl">
            <tbody>
              {memberOf.map((c) => (
                <tr key={c.id}>
                  <td>{c.name}</td>
                  <td className="w-64">
                    <DigestToggle action={setMyDigestAction} campaignId={c.id} receiving={!stopped.has(c.id)} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="mt-8">
        <h3 className="mb-2">API tokens</h3>
        <TokenPanel campaigns={mine.map((c) => ({ id: c.id, name: c.name }))} />
      </section>
    </main>
  );
}
