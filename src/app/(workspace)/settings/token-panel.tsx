"use client";
import { useState } from "react";
import { ApiError } from "@/hooks/fetcher";
import { createToken, revokeToken, useTokens, type TokenListItem } from "@/hooks/use-tokens";
import { TOKEN_DEFAULT_DAYS, TOKEN_MAX_DAYS, TOKEN_SCOPES, tokenScopeLabels, type TokenScope } from "@/lib/api-tokens";

type CampaignChoice = { id: string; name: string };

const day = (iso: string | null) => (iso ? iso.slice(0, 10) : "never");
const when = (iso: string | null) => (iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : "never");

/** Personal API tokens: create (the secret is shown once), list and revoke. */
export function TokenPanel({ campaigns }: { campaigns: CampaignChoice[] }) {
  const { data, error, mutate } = useTokens();
  const [name, setName] = useState("");
  const [scope, setScope] = useState<TokenScope>("read");
  const [limit, setLimit] = useState(false);
  const [chosen, setChosen] = useState<string[]>([]);
  const [days, setDays] = useState(String(TOKEN_DEFAULT_DAYS));
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const [fresh, setFresh] = useState<{ name: string; token: string; expiresAt: string } | null>(null);
  const [copied, setCopied] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setProblem(null);
    const n = Number(days);
    if (!name.trim()) return setProblem("Give the token a name, for example the script or machine that uses it.");
    if (!Number.isInteger(n) || n < 1 || n > TOKEN_MAX_DAYS)
      return setProblem(`Expiry is a whole number of days from 1 to ${TOKEN_MAX_DAYS}.`);
    if (limit && chosen.length === 0) return setProblem("Choose at least one campaign, or allow all of yours.");
    setBusy(true);
    try {
      const t = await createToken({
        name: name.trim(),
        scope,
        expiresInDays: n,
        ...(limit ? { campaignIds: chosen } : {}),
      });
      setFresh({ name: name.trim(), token: t.token, expiresAt: t.expiresAt });
      setCopied(false);
      setName("");
      await mutate();
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : "The token could not be created. Try again.");
    } finally {
      setBusy(false);
    }
  }

  async function revoke(t: TokenListItem) {
    if (!window.confirm(`Revoke “${t.name}”? Scripts using it stop working at once.`)) return;
    try {
      await revokeToken(t.id);
      await mutate();
    } catch (err) {
      setProblem(err instanceof ApiError ? err.message : "The token could not be revoked. Try again.");
    }
  }

  return (
    <div className="flex flex-col gap-4">
      <p className="max-w-2xl text-sm text-ink-muted">
        A token lets a script use the JSON API as you, with <code>Authorization: Bearer &lt;token&gt;</code>. It never
        does more than your role in each campaign allows, and loses access when you do. Treat it like a password.
      </p>
      {fresh ? (
        <div role="status" className="card max-w-2xl border-pass/50 p-3" data-testid="new-token">
          <p className="mb-1 text-sm">
            <b>“{fresh.name}”</b> was created; it expires {day(fresh.expiresAt)}. Copy the token now: it is shown only
            this once and cannot be recovered.
          </p>
          <div className="flex items-center gap-2">
            <code className="flex-1 break-all rounded bg-paper-sunk px-2 py-1 font-mono text-xs">{fresh.token}</code>
            <button
              type="button"
              className="btn-quiet px-2 py-0.5 text-xs"
              onClick={() => navigator.clipboard?.writeText(fresh.token).then(() => setCopied(true))}
            >
              {copied ? "Copied" : "Copy"}
            </button>
            <button type="button" className="btn-quiet px-2 py-0.5 text-xs" onClick={() => setFresh(null)}>
              Done
            </button>
          </div>
        </div>
      ) : null}
      <form onSubmit={submit} className="card flex max-w-2xl flex-col gap-3 p-4" noValidate>
        {problem ? (
          <p role="alert" className="rounded bg-fail-soft px-2 py-1.5 text-sm text-fail">
            {problem}
          </p>
        ) : null}
        <label>
          <span className="field-label">Name</span>
          <input
            className="input"
            name="tokenName"
            maxLength={100}
            placeholder="e.g. reader PC upload script"
            value={name}
            onChange={(e) => setName(e.target.value)}
          />
        </label>
        <fieldset>
          <legend className="field-label">Access</legend>
          <div className="flex gap-4 text-sm">
            {TOKEN_SCOPES.map((s) => (
              <label key={s} className="flex items-center gap-1.5">
                <input type="radio" name="scope" value={s} checked={scope === s} onChange={() => setScope(s)} />
                {tokenScopeLabels[s]}
              </label>
            ))}
          </div>
        </fieldset>
        <fieldset>
          <legend className="field-label">Campaigns</legend>
          <label className="flex items-center gap-1.5 text-sm">
            <input type="checkbox" checked={limit} onChange={(e) => setLimit(e.target.checked)} />
            Only chosen campaigns (otherwise every campaign you belong to, now and later)
          </label>
          {limit ? (
            campaigns.length === 0 ? (
              <p className="mt-1 text-xs text-ink-muted">You are not a member of any campaign.</p>
            ) : (
              <div className="mt-1 flex max-h-40 flex-col gap-1 overflow-auto pl-5 text-sm">
                {campaigns.map((c) => (
                  <label key={c.id} className="flex items-center gap-1.5">
                    <input
                      type="checkbox"
                      checked={chosen.includes(c.id)}
                      onChange={(e) =>
                        setChosen((cur) => (e.target.checked ? [...cur, c.id] : cur.filter((id) => id !== c.id)))
                      }
                    />
                    {c.name}
                  </label>
                ))}
              </div>
            )
          ) : null}
        </fieldset>
        <label className="max-w-48">
          <span className="field-label">Expires after (days, 1–{TOKEN_MAX_DAYS})</span>
          <input
            className="input"
            name="expiresInDays"
            type="number"
            min={1}
            max={TOKEN_MAX_DAYS}
            step={1}
            value={days}
            onChange={(e) => setDays(e.target.value)}
          />
        </label>
        <button className="btn-primary self-start" disabled={busy}>
          {busy ? "Creating…" : "Create token"}
        </button>
      </form>
      {error ? (
        <p className="text-sm text-fail">{error instanceof Error ? error.message : "The tokens could not be read."}</p>
      ) : !data ? (
        <p className="text-sm text-ink-muted">Loading your tokens…</p>
      ) : data.items.length === 0 ? (
        <p className="text-sm text-ink-muted">You have no API tokens.</p>
      ) : (
        <table className="table-dense card">
          <thead>
            <tr>
              <th>Name</th>
              <th>Access</th>
              <th>Campaigns</th>
              <th>Created (UTC)</th>
              <th>Last used</th>
              <th>Expires (UTC)</th>
              <th>State</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {data.items.map((t) => (
              <tr key={t.id} className={t.status === "active" ? "" : "text-ink-muted"}>
                <td>{t.name}</td>
                <td>{tokenScopeLabels[t.scope]}</td>
                <td>
                  {t.campaigns ? t.campaigns.map((c) => c.name ?? "(deleted campaign)").join(", ") : "All of yours"}
                </td>
                <td className="whitespace-nowrap">{day(t.createdAt)}</td>
                <td className="whitespace-nowrap" title="Recorded to the minute">
                  {when(t.lastUsedAt)}
                </td>
                <td className="whitespace-nowrap">{day(t.expiresAt)}</td>
                <td className="whitespace-nowrap">
                  {t.status === "revoked" ? `revoked ${day(t.revokedAt)}` : t.status}
                </td>
                <td>
                  {t.status === "active" ? (
                    <button type="button" className="btn-danger px-2 py-0.5 text-xs" onClick={() => revoke(t)}>
                      Revoke
                    </button>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
