/**
 * Runs once when the server starts. Stamps each request with its TCP peer's address (see
 * PEER_HEADER in src/server/auth/client-address.ts): Next's request APIs expose no socket, and the
 * throttling must not believe a client-written X-Forwarded-For.
 */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const http = await import("node:http");
  const marker = Symbol.for("inhibitrack.peer-stamp");
  const proto = http.Server.prototype as unknown as Record<symbol, unknown> & {
    emit: (event: string | symbol, ...args: unknown[]) => boolean;
  };
  if (proto[marker]) return;
  proto[marker] = true;
  const emit = proto.emit;
  proto.emit = function (this: unknown, event: string | symbol, ...args: unknown[]) {
    if (event === "request") {
      const req = args[0] as {
        headers: Record<string, string | string[] | undefined>;
        socket?: { remoteAddress?: string };
      };
      // Same name as PEER_HEADER; a client-sent header of that name is replaced, never trusted.
      req.headers["x-inhibitrack-peer"] = req.socket?.remoteAddress ?? "";
    }
    return emit.call(this, event, ...args);
  };
}
