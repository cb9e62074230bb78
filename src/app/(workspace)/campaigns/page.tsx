import Link from "next/link";
import { pageUser } from "@/server/auth/page-guard";
import { campaignsFor } from "@/server/services/campaigns";
import { roleLabels } from "@/lib/roles";
import { EmptyState } from "@/components/ui/empty-state";
import { CreateCampaignForm } from "./_components/create-campaign-form";
import { createCampaignAction } from "./actions";

export const metadata = { title: "Campaigns" };

export default async function CampaignsPage() {
  const user = await pageUser();
  const list = await campaignsFor(user);
  return (
    <main className="mx-auto w-full max-w-5xl px-6 py-6">
      <h1 className="mb-4">Campaigns</h1>
      {list.length === 0 ? (
        <EmptyState title="You are not a member of any campaign yet.">
          An administrator adds you to a campaign with a role; the invitation arrives by e-mail.
        </EmptyState>
      ) : (
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Campaign</th>
              <th>Target</th>
              <th>Your role</th>
              <th>Created</th>
            </tr>
          </thead>
          <tbody>
            {list.map((c) => (
              <tr key={c.id}>
                <td>
                  <Link href={`/campaigns/${c.id}`}>{c.name}</Link>
                </td>
                <td className="text-ink-soft">{c.targetEnzyme}</td>
                <td>
                  {c.role ? roleLabels[c.role] : <span className="text-ink-muted">administrator (not a member)</span>}
                </td>
                <td className="num text-ink-muted">{c.createdAt.toISOString().slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {user.globalRole === "admin" ? (
        <section className="mt-8">
          <h2 className="mb-2">New campaign</h2>
          <CreateCampaignForm action={createCampaignAction} />
        </section>
      ) : null}
    </main>
  );
}
