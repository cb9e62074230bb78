import { NextResponse, type NextRequest } from "next/server";

const COOKIE = "inhibitrack_session";

/**
 * The Content-Security-Policy of a page. Scripts run only with this request's nonce ('strict-dynamic'
 * lets the chunks Next's nonce'd scripts load run too); Next reads the nonce from the request's own
 * CSP header and puts it on every script it writes. Styles need 'unsafe-inline': Plotly and AG Grid
 * inject <style> elements and the server-rendered markup has style attributes, neither of which
 * can carry a nonce (and a nonce in style-src would switch 'unsafe-inline' off). Images: our own,
 * plus data: and blob: for Plotly's "download as PNG" and AG Grid's icons. Development mode adds
 * 'unsafe-eval' for React's dev tooling and a websocket for hot reload.
 */
export function pageCsp(nonce: string, dev = process.env.NODE_ENV === "development"): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${dev ? " ws: wss:" : ""}`,
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/**
 * Per page request: a fresh nonce and the page's CSP (the other security headers, for every
 * response including the API's, are in next.config.ts), and the session cookie extended on page
 * loads (Server Components cannot set cookies; the session row itself is extended by lucia when it
 * is validated).
 */
export function proxy(req: NextRequest) {
  const nonce = Buffer.from(crypto.getRandomValues(new Uint8Array(16))).toString("base64");
  const csp = pageCsp(nonce);
  const requestHeaders = new Headers(req.headers);
  requestHeaders.set("content-security-policy", csp);
  const res = NextResponse.next({ request: { headers: requestHeaders } });
  res.headers.set("content-security-policy", csp);
  if (req.method === "GET") {
    const token = req.cookies.get(COOKIE)?.value;
    if (token) {
      res.cookies.set(COOKIE, token, {
        path: "/",
        maxAge: 60 * 60 * 24 * 30,
        sameSite: "lax",
        httpOnly: true,
        secure: process.env.NODE_ENV === "production",
      });
    }
  }
  return res;
}

// Pages only: API calls come from pages that already extended the cookie, and the API's own
// session check extends the session row; static files need no nonce.
export const config = { matcher: ["/((?!api/|_next/static|_next/image|favicon.svg).*)"] };
