import "server-only";
import { env } from "@/env";

export const DEFAULT_AFTER_SIGN_IN = "/campaigns";

/**
 * The one check for a `next` / return address before it is followed. The value is parsed the
 * way a browser would parse it, `new URL(next, appOrigin)`, and accepted only when it stays on
 * the app's origin; what is returned is the parsed path + query + fragment (never the raw input),
 * so the Location header says exactly what was checked. Refused, and the default returned:
 * anything not starting with one "/", control characters (browsers drop tab/CR/LF inside URLs,
 * so "/\t/x" becomes "//x"), backslashes (read as "/"), and any parse whose path starts with "//"
 * ("/.//x" parses to "//x", a host-relative address). Common practice: OWASP Unvalidated
 * Redirects and Forwards Cheat Sheet (from memory).
 */
export function safeNextPath(next: unknown, fallback = DEFAULT_AFTER_SIGN_IN, appOrigin = env.APP_URL): string {
  if (typeof next !== "string" || next.length === 0 || next.length > 2048) return fallback;
  if (/[\u0000-\u001f\u007f-\u009f\\]/.test(next)) return fallback;
  if (!next.startsWith("/") || next.startsWith("//")) return fallback;
  let url: URL;
  let origin: string;
  try {
    origin = new URL(appOrigin).origin;
    url = new URL(next, origin);
  } catch {
    return fallback;
  }
  if (url.origin !== origin) return fallback;
  if (!url.pathname.startsWith("/") || url.pathname.startsWith("//")) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}
