// route() turns a refusal for load or throttling into a 429 whose Retry-After says how long to
// wait, taken from where it was thrown (a throttled sign-in's delay, a busy pool's few seconds),
// instead of one fixed quarter of an hour for every 429.
import { describe, expect, it } from "vitest";
import { route } from "./http";
import { AppError } from "./errors";

const call = (e: AppError) =>
  route(async () => {
    throw e;
  })(new Request("http://127.0.0.1/api/x"), { params: Promise.resolve({}) });

describe("route() and Retry-After", () => {
  it("uses the wait the refusal names", async () => {
    const r = await call(new AppError("throttled", "busy", { extra: { retryAfterSeconds: 4.2 } }));
    expect(r.status).toBe(429);
    expect(r.headers.get("retry-after")).toBe("5");
    expect(((await r.json()) as { retryAfterSeconds: number }).retryAfterSeconds).toBe(4.2);
  });

  it("falls back to a minute when none is named", async () => {
    const r = await call(new AppError("throttled"));
    expect(r.headers.get("retry-after")).toBe("60");
  });

  it("sends no Retry-After on other refusals", async () => {
    const r = await call(new AppError("conflict"));
    expect(r.status).toBe(409);
    expect(r.headers.get("retry-after")).toBeNull();
  });
});
