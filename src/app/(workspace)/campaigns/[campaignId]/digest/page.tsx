import { pageCampaign } from "@/server/auth/page-guard";
import { can } from "@/lib/roles";
import { previewDigest, sendLog, recipients, digestWeek, digestDue } from "@/server/services/digest";
import { DigestControls, ScheduleForm } from "./digest-forms";
import { sendDigestNowAction, setDigestScheduleAction } from "./actions";

export const metadata = { title: "Weekly digest" };

const days = ["", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"];

export default async function DigestPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { user, role, campaign } = await pageCampaign(campaignId);
  const mayManage = can(user.globalRole, role, "digest:send");
  const now = new Date();
  const [preview, log, people] = await Promise.all([
    previewDigest(campaignId, { id: user.id, name: user.name }, now),
    mayManage ? sendLog(campaignId) : Promise.resolve([]),
    recipients(campaignId),
  ]);
  return (
    <div className="flex flex-col gap-5">
      <div>
        <h1>Weekly digest</h1>
        <p className="text-sm text-ink-muted">
          Sent {days[campaign.digestWeekday]} at {String(campaign.digestHour).padStart(2, "0")}:00 ({campaign.timeZone})
          to every member who has not stopped it — {people.length} recipient{people.length === 1 ? "" : "s"} now. One
          digest per member per week (this week: {digestWeek(now, campaign.timeZone)}
          {digestDue(campaign, now) ? ", due" : ", not yet due"}).
        </p>
      </div>
      {mayManage ? (
        <div className="grid gap-4 md:grid-cols-2">
          <DigestControls campaignId={campaignId} action={sendDigestNowAction} />
          <ScheduleForm
            campaignId={campaignId}
            action={setDigestScheduleAction}
            values={{
              digestWeekday: campaign.digestWeekday,
              digestHour: campaign.digestHour,
              timeZone: campaign.timeZone,
            }}
          />
        </div>
      ) : (
        <p className="text-xs text-ink-muted">
          The project lead or an administrator sends the digest and sets its schedule. You can stop it for yourself in
          your settings.
        </p>
      )}
      <section>
        <h3 className="mb-2">Preview (as you would receive it now)</h3>
        <p className="mb-1 text-xs text-ink-muted">Subject: {preview.subject}</p>
        <iframe
          title="Digest preview"
          srcDoc={preview.html}
          sandbox=""
          className="h-[720px] w-full max-w-3xl rounded-md border border-rule bg-paper-raised"
        />
      </section>
      {mayManage ? (
        <section>
          <h3 className="mb-2">Send log</h3>
          {log.length === 0 ? (
            <p className="text-sm text-ink-muted">Nothing sent yet.</p>
          ) : (
            <table className="table-dense card">
              <thead>
                <tr>
                  <th>Week of</th>
                  <th>Recipient</th>
                  <th>Status</th>
                  <th className="text-right">Attempts</th>
                  <th>Trigger</th>
                  <th>Sent (UTC)</th>
                  <th>Next attempt (UTC)</th>
                  <th>Last error</th>
                </tr>
              </thead>
              <tbody>
                {log.map((r) => (
                  <tr key={r.id}>
                    <td className="num">{r.week}</td>
                    <td>{r.email}</td>
                    <td>
                      <span
                        className={`chip ${r.status === "sent" ? "bg-pass-soft text-pass" : r.status === "failed" ? "bg-fail-soft text-fail" : "bg-paper-sunk text-ink-muted"}`}
                      >
                        {r.status}
                      </span>
                    </td>
                    <td className="num text-right">{r.attempts}</td>
                    <td>{r.trigger}</td>
                    <td className="num">{r.sentAt ? r.sentAt.toISOString().slice(0, 16).replace("T", " ") : "—"}</td>
                    <td className="num">
                      {r.status === "failed" && r.nextAttemptAt
                        ? r.nextAttemptAt.toISOString().slice(0, 16).replace("T", " ")
                        : "—"}
                    </td>
                    <td className="max-w-64 text-xs text-fail">{r.lastError ?? ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </section>
      ) : null}
    </div>
  );
}
