// Body caps hold while the body streams: a chunked body without Content-Length, or one whose
// Content-Length lies, is cut off at the cap (413) without being read whole.
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { readBodyCapped, readMultipart } from "./multipart";
import { AppError } from "./errors";

function chunked(chunks: number, size: number, headers: Record<string, string> = {}) {
  let sent = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      if (sent >= chunks) return c.close();
      sent++;
      c.enqueue(new Uint8Array(size).fill(0x61));
    },
  });
  const req = new Request("http://127.0.0.1/x", { method: "POST", body, headers, duplex: "half" } as RequestInit);
  return { req, sent: () => sent };
}

describe("readBodyCapped", () => {
  it("refuses a chunked body over the cap after reading no more than the cap (plus one chunk)", async () => {
    const { req, sent } = chunked(1000, 64 * 1024);
    const e = await readBodyCapped(req, 1024 * 1024).catch((x: unknown) => x);
    expect(e).toBeInstanceOf(AppError);
    expect((e as AppError).status).toBe(413);
    expect((e as AppError).message).toBe("The request body is more than 1.0 MB; the limit is 1.0 MB.");
    expect(sent()).toBeLessThanOrEqual(18);
  });

  it("does not trust a Content-Length that under-declares the body", async () => {
    const { req } = chunked(100, 64 * 1024, { "content-length": "10" });
    await expect(readBodyCapped(req, 1024 * 1024)).rejects.toThrow(/more than 1\.0 MB/);
  });

  it("refuses a declared size over the cap before reading", async () => {
    const { req, sent } = chunked(100, 64 * 1024, { "content-length": String(5 * 1024 * 1024) });
    await expect(readBodyCapped(req, 1024 * 1024)).rejects.toThrow("The request body is 5.0 MB; the limit is 1.0 MB.");
    expect(sent()).toBeLessThanOrEqual(1);
  });

  it("returns a body under the cap whole", async () => {
    const { req } = chunked(3, 1000);
    expect((await readBodyCapped(req, 1024 * 1024)).byteLength).toBe(3000);
  });
});

describe("readMultipart", () => {
  it("parses a form within the cap and refuses a file over it by name", async () => {
    const schema = z.object({ file: z.instanceof(File), name: z.string() });
    const form = new FormData();
    form.set("name", "x");
    form.set("file", new File([new Uint8Array(2000)], "plate.csv"));
    const ok = await readMultipart(new Request("http://127.0.0.1/x", { method: "POST", body: form }), schema, 4000);
    expect(ok.file.size).toBe(2000);
    await expect(
      readMultipart(new Request("http://127.0.0.1/x", { method: "POST", body: form }), schema, 1000),
    ).rejects.toThrow("plate.csv: the file is 2 KB; the limit is 1 KB.");
  });
});
