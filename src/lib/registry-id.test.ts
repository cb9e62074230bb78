// Common practice: registry IDs are a prefix and a zero-padded serial number; the product's own
// format (six digits, longer numbers written in full) is checked here; the SQL that issues IDs in
// bulk is checked against it in Postgres by src/server/services/compounds/registry-id.int.test.ts.
import { describe, expect, it } from "vitest";
import { formatRegistryId, looksLikeRegistryId, registryIdPattern, registryNumber } from "./registry-id";

describe("registry-ID format", () => {
  it("pads to six digits and writes larger numbers in full", () => {
    expect(formatRegistryId("INH-", 123)).toBe("INH-000123");
    expect(formatRegistryId("INH-", 999_999)).toBe("INH-999999");
    expect(formatRegistryId("INH-", 1_234_567)).toBe("INH-1234567");
    expect(() => formatRegistryId("INH-", 0)).toThrow(/positive integer/);
  });
  it("accepts every ID the registry can issue, and nothing else", () => {
    const re = registryIdPattern("INH-");
    for (const n of [1, 42, 999_999, 1_000_000, 12_345_678]) expect(re.test(formatRegistryId("INH-", n))).toBe(true);
    for (const s of ["INH-12345", "ABC-000001", "INH-000001x", "inh-000001"]) expect(re.test(s)).toBe(false);
    expect(registryNumber("INH-", "INH-1000000")).toBe(1_000_000);
    expect(registryNumber("INH-", "X-1")).toBeNull();
    expect(looksLikeRegistryId("ab-12")).toBe(true);
  });
});
