// Shared set-up for database tests: invented test people in every role, sessions, and direct
// calls of route handlers and server actions as a given person (the real guard, the real DB).
import crypto from "node:crypto";
import { db } from "@/server/db/client";
import { users, campaigns, memberships } from "@/server/db/schema";
import { createSessionId, SESSION_COOKIE } from "@/server/auth/session";
import { hashPassword } from "@/server/auth/password";
import { withRequest } from "./next-shims";
import type { ActionState } from "@/server/action";

export const actors = ["signedOut", "nonMember", "viewer", "chemist", "assay", "lead", "admin"] as const;
export type Actor = (typeof actors)[number];
export type TestUser = { id: string; email: string; name: string };

export const TEST_PASSWORD = "correct horse battery";
let hashed: Promise<string> | null = null;

export type World = {
  tag: string;
  campaignId: string;
  otherCampaignId: string;
  people: Record<Exclude<Actor, "signedOut">, TestUser>;
};

/** A campaign with one person per role, a non-member (member of another campaign) and an admin. */
export async function makeWorld(tag = crypto.randomBytes(4).toString("hex")): Promise<World> {
  hashed ??= hashPassword(TEST_PASSWORD);
  const passwordHash = await hashed;
  const [c1] = await db
    .insert(campaigns)
    .values({ name: `Test campaign ${tag}`, targetEnzyme: "Test enzyme (invented)" })
    .returning();
  const [c2] = await db
    .insert(campaigns)
    .values({ name: `Other campaign ${tag}`, targetEnzyme: "Other enzyme (invented)" })
    .returning();
  const people = {} as World["people"];
  for (const a of actors) {
    if (a === "signedOut") continue;
    const u = { id: crypto.randomUUID(), email: `${a.toLowerCase()}-${tag}@test.invalid`, name: `${a} ${tag}` };
    await db.insert(users).values({ ...u, passwordHash, globalRole: a === "admin" ? "admin" : "member" });
    people[a] = u;
  }
  await db.insert(memberships).values([
    { campaignId: c1!.id, userId: people.viewer.id, role: "viewer" },
    { campaignId: c1!.id, userId: people.chemist.id, role: "chemist" },
    { campaignId: c1!.id, userId: people.assay.id, role: "assay" },
    { campaignId: c1!.id, userId: people.lead.id, role: "lead" },
    { campaignId: c2!.id, userId: people.nonMember.id, role: "lead" },
  ]);
  return { tag, campaignId: c1!.id, otherCampaignId: c2!.id, people };
}

export async function newTestUser(tag: string, globalRole: "admin" | "member" = "member"): Promise<TestUser> {
  hashed ??= hashPassword(TEST_PASSWORD);
  const u = {
    id: crypto.randomUUID(),
    email: `u-${tag}-${crypto.randomBytes(3).toString("hex")}@test.invalid`,
    name: `User ${tag}`,
  };
  await db.insert(users).values({ ...u, passwordHash: await hashed, globalRole });
  return u;
}

export function userOf(world: World, actor: Actor): TestUser | null {
  return actor === "signedOut" ? null : world.people[actor];
}

const HOST = "127.0.0.1:3000";

/** Runs fn as `user` (a fresh session) inside a request scope. */
export async function as<T>(
  user: TestUser | null,
  fn: () => Promise<T>,
  extraHeaders: Record<string, string> = {},
): Promise<T> {
  const cookies: Record<string, string> = {};
  if (user) cookies[SESSION_COOKIE] = await createSessionId(user.id);
  return withRequest({ cookies, headers: { host: HOST, "x-forwarded-for": "203.0.113.7", ...extraHeaders } }, fn);
}

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;

/**
 * While set, callRoute authenticates each signed-in caller with `Authorization: Bearer` (the
 * secret `mint` returns for that person) instead of a session cookie, and sends no Origin: so the
 * role matrix can call every route as a script would. Server actions keep their cookies.
 */
let bearerFor: ((user: TestUser) => Promise<string>) | null = null;
export function useBearerTokens(mint: ((user: TestUser) => Promise<string>) | null): void {
  bearerFor = mint;
}

export async function callRoute(
  handler: unknown,
  opts: {
    user: TestUser | null;
    method?: string;
    path: string;
    params?: Record<string, string>;
    body?: unknown;
    headers?: Record<string, string>;
  },
): Promise<{ status: number; json: unknown; response: Response }> {
  const method = opts.method ?? "GET";
  const bearer = bearerFor && opts.user ? await bearerFor(opts.user) : null;
  const headers: Record<string, string> = {
    host: HOST,
    ...(method !== "GET" && !bearer ? { origin: `http://${HOST}` } : {}),
    ...(bearer ? { authorization: `Bearer ${bearer}` } : {}),
    ...(opts.headers ?? {}),
  };
  let body: BodyInit | undefined;
  if (opts.body instanceof FormData) body = opts.body;
  else if (opts.body !== undefined) {
    body = JSON.stringify(opts.body);
    headers["content-type"] = "application/json";
  }
  return as(
    bearer ? null : opts.user,
    async () => {
      const req = new Request(`http://${HOST}${opts.path}`, { method, headers, body });
      const response = await (handler as Handler)(req, { params: Promise.resolve(opts.params ?? {}) });
      const text = await response.clone().text();
      let json: unknown = text;
      try {
        json = JSON.parse(text);
      } catch {}
      return { status: response.status, json, response };
    },
    headers,
  );
}

export type ActionOutcome =
  { kind: "state"; state: ActionState } | { kind: "redirect"; to: string } | { kind: "notFound" };

type FormActionFn = (prev: ActionState, form: FormData) => Promise<ActionState>;

/** Calls a server action like a form post would; redirect()/notFound() become outcomes. */
export async function callAction(
  action: unknown,
  fields: Record<string, string>,
  user: TestUser | null,
): Promise<ActionOutcome> {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  return as(user, async () => {
    try {
      const fn = action as FormActionFn | (() => Promise<void>);
      const state = fn.length === 0 ? await (fn as () => Promise<void>)() : await (fn as FormActionFn)(null, form);
      return { kind: "state", state: (state ?? null) as ActionState };
    } catch (e) {
      const digest = (e as { digest?: string }).digest ?? "";
      if (digest.startsWith("NEXT_REDIRECT")) return { kind: "redirect", to: digest.split(";")[2] ?? "" };
      if (digest.startsWith("NEXT_HTTP_ERROR_FALLBACK;404")) return { kind: "notFound" };
      throw e;
    }
  });
}

/** Was the call refused by the guard (signed out, not a member, or role lacks the capability)? */
export function deniedRoute(status: number): boolean {
  return status === 401 || status === 403 || status === 404;
}
export function deniedAction(o: ActionOutcome): boolean {
  if (o.kind === "notFound") return true;
  if (o.kind === "redirect") return o.to.startsWith("/sign-in");
  return !!o.state && !o.state.ok && (o.state.status === 401 || o.state.status === 403 || o.state.status === 404);
}

/** The e-mail fake's outbox, read the way the tests are meant to read it. */
export async function outbox(): Promise<
  {
    id: string;
    to: string[];
    subject: string;
    text: string | null;
    html: string | null;
    idempotency_key: string | null;
  }[]
> {
  const base = process.env.RESEND_BASE_URL;
  if (!base) throw new Error("RESEND_BASE_URL is not set: run the tests with `npm test`.");
  const r = await fetch(`${base}/__outbox`);
  return ((await r.json()) as { data: never[] }).data;
}

export function linkIn(text: string | null, pathPrefix: string): string | null {
  const m = text?.match(new RegExp(`https?://[^\\s"]+${pathPrefix}([A-Za-z0-9_-]+)`));
  return m?.[1] ?? null;
}
