import { NextResponse, type NextRequest } from "next/server";

const COOKIE = "inhibitrack_session";

/**
 * Extends the session cookie on page loads (Server Components cannot set cookies; the session
 * row itself is extended by lucia when it is validated).
 */
export function proxy(req: NextRequest) {
  const res = NextResponse.next();
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
// session check extends the session row.
export const config = { matcher: ["/((?!api/|_next/static|_next/image|favicon.svg).*)"] };
