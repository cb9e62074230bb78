"use client";

/** An API error as the route handlers send it: `{ error, code, details?, … }` and the HTTP status. */
export class ApiError extends Error {
  readonly status: number;
  readonly body: {
    error?: string;
    code?: string;
    details?: { record?: number; line?: number; well?: string; field?: string; message: string }[];
  } & Record<string, unknown>;
  constructor(status: number, body: ApiError["body"]) {
    super(body.error ?? `The server answered ${status}.`);
    this.status = status;
    this.body = body;
  }
}

/** The one SWR fetcher: JSON in, ApiError (with the server's sentence) on any non-2xx answer. */
export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const r = await fetch(url, { credentials: "same-origin", ...init });
  const text = await r.text();
  let body: unknown = null;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    body = { error: `The server answered ${r.status} with something that is not JSON.` };
  }
  if (!r.ok) throw new ApiError(r.status, (body ?? {}) as ApiError["body"]);
  return body as T;
}
