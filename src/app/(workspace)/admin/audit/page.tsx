import Link from "next/link";
import { z } from "zod";
import { pageAdmin } from "@/server/auth/page-guard";
import { auditEntries, campaignNames } from "@/server/services/campaigns";

export const metadata = { title: "Audit log" };

const PAGE = 50;
const q = z.object({
  campaign: z.string().uuid().optional().catch(undefined),
  action: z.string().max(60).optional().catch(undefined),
  actor: z.string().max(120).optional().catch(undefined),
  page: z.coerce.number().int().min(1).default(1).catch(1),
});

function short(v: unknown): string {
  if (v === null || v === undefined) return "";
  const s = JSON.stringify(v);
  return s.length > 140 ? `${s.slice(0, 140)}…` : s;
}

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string>> }) {
  await pageAdmin();
  const f = q.parse(await searchParams);
  const [{ items, total }, allCampaigns] = await Promise.all([
    auditEntries({
      campaignId: f.campaign,
      action: f.action || undefined,
      actor: f.actor || undefined,
      limit: PAGE,
      offset: (f.page - 1) * PAGE,
    }),
    campaignNames(),
  ]);
  const pages = Math.max(1, Math.ceil(total / PAGE));
  const link = (page: number) =>
    `?${new URLSearchParams({ ...(f.campaign ? { campaign: f.campaign } : {}), ...(f.action ? { action: f.action } : {}), ...(f.actor ? { actor: f.actor } : {}), page: String(page) })}`;
  return (
    <main className="mx-auto w-full max-w-6xl px-6 py-6">
      <h1 className="mb-1">Audit log</h1>
      <p className="mb-4 text-sm text-ink-muted">
        Append-only: every change that feeds a decision, with who, when, and the values before and after. Times in UTC.
      </p>
      <form className="mb-3 flex flex-wrap items-end gap-2" method="get">
        <label>
          <span className="field-label">Campaign</span>
          <select className="input" name="campaign" defaultValue={f.campaign ?? ""}>
            <option value="">All</option>
            {allCampaigns.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
        </label>
        <label>
          <span className="field-label">Action contains</span>
          <input className="input" name="action" defaultValue={f.action ?? ""} placeholder="e.g. membership" />
        </label>
        <label>
          <span className="field-label">Who (e-mail contains)</span>
          <input className="input" name="actor" defaultValue={f.actor ?? ""} />
        </label>
        <button className="btn-quiet" type="submit">
          Filter
        </button>
      </form>
      <table className="table-dense card">
        <thead>
          <tr>
            <th className="w-36">When (UTC)</th>
            <th>Who</th>
            <th>Campaign</th>
            <th>Action</th>
            <th>Entity</th>
            <th>Before</th>
            <th>After</th>
            <th>Reason</th>
          </tr>
        </thead>
        <tbody>
          {items.length === 0 ? (
            <tr>
              <td colSpan={8} className="text-ink-muted">
                No entries match.
              </td>
            </tr>
          ) : (
            items.map(({ log, campaignName }) => (
              <tr key={log.id}>
                <td className="num whitespace-nowrap text-ink-muted">
                  {log.at.toISOString().slice(0, 19).replace("T", " ")}
                </td>
                <td>{log.actorEmail ?? "system"}</td>
                <td className="text-ink-soft">{campaignName ?? "—"}</td>
                <td className="font-medium">{log.action}</td>
                <td className="text-ink-soft">
                  {log.entityType}
                  {log.entityId ? <span className="text-ink-faint"> {log.entityId.slice(0, 8)}</span> : null}
                </td>
                <td className="max-w-48 break-all font-mono text-2xs text-ink-muted">{short(log.before)}</td>
                <td className="max-w-48 break-all font-mono text-2xs text-ink-muted">{short(log.after)}</td>
                <td className="text-ink-soft">{log.reason ?? ""}</td>
              </tr>
            ))
          )}
        </tbody>
      </table>
      <p className="mt-2 flex items-center gap-3 text-xs text-ink-muted">
        <span className="num">
          {total} entries · page {f.page} of {pages}
        </span>
        {f.page > 1 ? <Link href={link(f.page - 1)}>Previous</Link> : null}
        {f.page < pages ? <Link href={link(f.page + 1)}>Next</Link> : null}
      </p>
    </main>
  );
}
