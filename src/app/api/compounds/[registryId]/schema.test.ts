// The path schema of GET /api/compounds/{registryId} accepts every ID the registry issues (the rule
// of src/lib/registry-id.ts, common practice: prefix and zero-padded serial) and refuses the rest.
import { describe, expect, it } from "vitest";
import { formatRegistryId } from "@/lib/registry-id";
import { registryIdParam } from "./schema";

describe("registryIdParam", () => {
  it("accepts IDs with six digits and longer ones written in full", () => {
    for (const n of [1, 999_999, 1_000_000, 12_345_678])
      expect(registryIdParam.parse({ registryId: formatRegistryId("INH-", n) }).registryId).toBe(
        formatRegistryId("INH-", n),
      );
    expect(registryIdParam.parse({ registryId: " inh-000042 " }).registryId).toBe("inh-000042");
  });
  it("refuses text that is not a registry ID, with the sentence the API shows", () => {
    for (const registryId of ["INH000123", "INH-12x", "-000123", "INH-"]) {
      const r = registryIdParam.safeParse({ registryId });
      expect(r.success).toBe(false);
      expect(r.error?.issues[0]?.message).toBe("registryId must look like INH-000123");
    }
  });
});
