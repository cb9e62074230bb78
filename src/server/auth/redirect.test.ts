// Known open-redirect tricks (common practice: OWASP Unvalidated Redirects and Forwards Cheat
// Sheet and its bypass lists, from memory). Each is checked the way a browser would follow the
// result: resolved against the app's origin, it must stay there.
import { describe, it, expect } from "vitest";
import { safeNextPath } from "./redirect";

const APP = "http://127.0.0.1:3000";
const follow = (next: unknown) => new URL(safeNextPath(next, "/campaigns", APP), APP);

describe("safeNextPath", () => {
  it("keeps a local path with its query and fragment", () => {
    expect(safeNextPath("/campaigns/abc/hits?sort=ki#top", "/campaigns", APP)).toBe("/campaigns/abc/hits?sort=ki#top");
    expect(safeNextPath("/settings", "/campaigns", APP)).toBe("/settings");
  });

  const tricks = [
    "//evil.example",
    "//evil.example/path",
    "///evil.example",
    "/\\evil.example",
    "\\\\evil.example",
    "/\\/evil.example",
    "/%09/evil.example/",
    "/\t/evil.example/",
    "/\n/evil.example",
    "/\r\n/evil.example",
    "/ /evil.example",
    "https:evil.example",
    "https://evil.example",
    "http:/evil.example",
    "javascript:alert(1)",
    "JaVaScRiPt:alert(1)",
    "data:text/html,<script>alert(1)</script>",
    "/.//evil.example",
    "/..//evil.example",
    "/a/..//evil.example",
    "/./\\evil.example",
    "%2F%2Fevil.example",
    "/%2F%2Fevil.example",
    "/%5Cevil.example",
    "evil.example",
    "@evil.example",
    "/@evil.example",
    "",
    " /campaigns",
    "\u0000//evil.example",
    "/\u2028/evil.example",
  ];

  it.each(tricks)("does not leave the origin for %j", (t) => {
    const u = follow(t);
    expect(u.origin).toBe(APP);
    expect(u.protocol).toBe("http:");
  });

  it("falls back to the default for the tricks that are not plain local paths", () => {
    for (const t of [
      "//evil.example",
      "/\\evil.example",
      "/\t/evil.example/",
      "https:evil.example",
      "javascript:alert(1)",
      "/.//evil.example",
    ])
      expect(safeNextPath(t, "/campaigns", APP)).toBe("/campaigns");
  });

  it("falls back for a non-string or an oversized value", () => {
    expect(safeNextPath(undefined, "/campaigns", APP)).toBe("/campaigns");
    expect(safeNextPath(["/x"], "/campaigns", APP)).toBe("/campaigns");
    expect(safeNextPath(`/${"a".repeat(3000)}`, "/campaigns", APP)).toBe("/campaigns");
  });
});
