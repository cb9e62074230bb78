import "server-only";
import { Resend } from "resend";
import { env } from "@/env";

// The resend SDK reads RESEND_BASE_URL itself; in development and tests it points at the local
// fake in docker-local-fakes/, in production it is unset (the real service). Configuration only.
let client: Resend | null = null;
function resend(): Resend {
  if (!env.RESEND_API_KEY) throw new Error("RESEND_API_KEY is not set: e-mail cannot be sent.");
  client ??= new Resend(env.RESEND_API_KEY, env.RESEND_BASE_URL ? { baseUrl: env.RESEND_BASE_URL } : undefined);
  return client;
}

export type Mail = { to: string | string[]; subject: string; html: string; text: string; idempotencyKey?: string };

export async function sendMail(m: Mail): Promise<{ id: string }> {
  const { data, error } = await resend().emails.send(
    { from: env.MAIL_FROM, to: m.to, subject: m.subject, html: m.html, text: m.text },
    m.idempotencyKey ? { idempotencyKey: m.idempotencyKey } : undefined,
  );
  if (error || !data) throw new Error(`E-mail was not accepted: ${error?.message ?? "no answer"}`);
  return { id: data.id };
}

/** For /api/health: does the e-mail service answer at all (any HTTP answer counts). */
export async function mailServiceAnswers(): Promise<boolean> {
  const base = env.RESEND_BASE_URL ?? "https://api.resend.com";
  try {
    const r = await fetch(base, { method: "GET", signal: AbortSignal.timeout(2000) });
    return r.status > 0;
  } catch {
    return false;
  }
}
