import { pageCampaign } from "@/server/auth/page-guard";
import { memberNamesOf, membersOf, pendingInvitations } from "@/server/services/campaigns";
import { can, roleLabels } from "@/lib/roles";
import { TeamForms, MemberRow, ThresholdsForm } from "./team-forms";
import { inviteAction, changeRoleAction, removeMemberAction, updateThresholdsAction } from "./actions";

export const metadata = { title: "Team & settings" };

export default async function TeamPage({ params }: { params: Promise<{ campaignId: string }> }) {
  const { campaignId } = await params;
  const { user, campaign, role } = await pageCampaign(campaignId);
  const isAdmin = user.globalRole === "admin";
  // E-mails, ids and invitations are for the people who run the team; the rest see names and roles.
  const manages = isAdmin || role === "lead";
  const [members, invites] = manages
    ? await Promise.all([membersOf(campaignId), pendingInvitations(campaignId)])
    : [(await memberNamesOf(campaignId)).map((m) => ({ ...m, userId: null, email: null })), []];
  return (
    <div className="flex max-w-4xl flex-col gap-6">
      <h1>Team &amp; settings</h1>
      <section>
        <h3 className="mb-2">Members ({members.length})</h3>
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Name</th>
              {manages ? <th>E-mail</th> : null}
              <th>Role</th>
              <th>Member since (UTC)</th>
              {isAdmin ? <th className="w-64">Change</th> : null}
            </tr>
          </thead>
          <tbody>
            {members.map((m, i) => (
              <tr key={m.userId ?? i}>
                <td>{m.name}</td>
                {manages ? <td className="text-ink-soft">{m.email}</td> : null}
                <td>{roleLabels[m.role]}</td>
                <td className="num text-ink-muted">{m.addedAt.toISOString().slice(0, 10)}</td>
                {isAdmin && m.userId ? (
                  <td>
                    <MemberRow
                      campaignId={campaignId}
                      userId={m.userId}
                      role={m.role}
                      changeRole={changeRoleAction}
                      remove={removeMemberAction}
                    />
                  </td>
                ) : null}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {manages ? (
        <section>
          <h3 className="mb-2">Pending invitations ({invites.length})</h3>
          {invites.length === 0 ? (
            <p className="text-sm text-ink-muted">None.</p>
          ) : (
            <table className="table-dense card">
              <thead>
                <tr>
                  <th>E-mail</th>
                  <th>Role</th>
                  <th>Sent (UTC)</th>
                  <th>Expires (UTC)</th>
                </tr>
              </thead>
              <tbody>
                {invites.map((i) => (
                  <tr key={i.id}>
                    <td>{i.email}</td>
                    <td>{roleLabels[i.role]}</td>
                    <td className="num text-ink-muted">{i.createdAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                    <td className="num text-ink-muted">{i.expiresAt.toISOString().slice(0, 16).replace("T", " ")}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          {isAdmin ? <TeamForms campaignId={campaignId} invite={inviteAction} /> : null}
        </section>
      ) : null}
      <section>
        <h3 className="mb-2">QC and hit thresholds</h3>
        <ThresholdsForm
          campaignId={campaignId}
          editable={can(user.globalRole, role, "campaign:settings")}
          values={{
            qcMinZPrime: campaign.qcMinZPrime,
            qcMaxCvPct: campaign.qcMaxCvPct,
            hitThresholdPct: campaign.hitThresholdPct,
          }}
          action={updateThresholdsAction}
        />
      </section>
    </div>
  );
}
