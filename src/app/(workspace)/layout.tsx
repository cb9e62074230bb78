import Link from "next/link";
import { redirect } from "next/navigation";
import { getCurrentSession } from "@/server/auth/session";
import { Wordmark } from "@/components/ui/logo";
import { signOutAction } from "../(auth)/actions";

export default async function WorkspaceLayout({ children }: { children: React.ReactNode }) {
  const { user } = await getCurrentSession();
  if (!user) redirect("/sign-in");
  return (
    <div className="flex min-h-screen flex-col">
      <header className="flex h-11 items-center gap-6 border-b border-rule bg-paper-raised px-4">
        <Link href="/campaigns" className="no-underline">
          <Wordmark />
        </Link>
        <nav className="flex items-center gap-4 text-sm" aria-label="Main">
          <Link href="/campaigns" className="text-ink-soft hover:text-ink">
            Campaigns
          </Link>
          <Link href="/compounds" className="text-ink-soft hover:text-ink">
            Compound registry
          </Link>
          {user.globalRole === "admin" ? (
            <Link href="/admin/audit" className="text-ink-soft hover:text-ink">
              Audit log
            </Link>
          ) : null}
        </nav>
        <div className="ml-auto flex items-center gap-3 text-sm">
          <Link href="/settings" className="text-ink-soft hover:text-ink" title="Your settings">
            {user.name}
          </Link>
          {user.globalRole === "admin" ? <span className="chip bg-info-soft text-info">admin</span> : null}
          <form action={signOutAction}>
            <button type="submit" className="text-xs text-ink-muted hover:text-ink">
              Sign out
            </button>
          </form>
        </div>
      </header>
      <div className="flex flex-1">{children}</div>
    </div>
  );
}
