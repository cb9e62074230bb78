import "server-only";
import type { JsonSchema } from "./json-schema";

/** Sample strings tried, in order, for a `pattern` with no format (the first that matches is used). */
const PATTERN_SAMPLES = ["INH-000123", "2026-12-02", "B3", "A1", "P-0001", "sample", "x", "1"];

/**
 * The smallest instance a JSON Schema accepts, for the reference page's examples and for the
 * document test (which checks that the route's own validator accepts it): required properties
 * only, the first enum value, `const`, `default`, the first branch of `anyOf`/`oneOf`, the lower
 * bound of numbers and of lengths. A schema it cannot satisfy (e.g. an unusual pattern, or a rule
 * across fields) needs an explicit example in the operation; the test says which.
 */
export function minimalExample(s: JsonSchema): unknown {
  if ("const" in s) return s.const;
  if (Array.isArray(s.enum)) return s.enum[0];
  if ("default" in s) return s.default;
  const branches = (s.anyOf ?? s.oneOf) as JsonSchema[] | undefined;
  if (branches?.length) return minimalExample(branches.find((b) => b.type !== "null") ?? branches[0]!);
  const type = Array.isArray(s.type) ? (s.type as string[]).find((t) => t !== "null") : (s.type as string | undefined);
  switch (type) {
    case "object": {
      const props = (s.properties ?? {}) as Record<string, JsonSchema>;
      const out: Record<string, unknown> = {};
      for (const key of (s.required ?? []) as string[]) out[key] = props[key] ? minimalExample(props[key]) : null;
      return out;
    }
    case "array": {
      const n = Math.max(1, Number(s.minItems ?? 0));
      const items = (s.items ?? {}) as JsonSchema;
      return Array.from({ length: n }, () => minimalExample(items));
    }
    case "integer":
    case "number": {
      if (typeof s.minimum === "number") return s.minimum;
      if (typeof s.exclusiveMinimum === "number")
        return type === "integer" ? s.exclusiveMinimum + 1 : s.exclusiveMinimum + 0.5;
      if (typeof s.maximum === "number") return Math.min(s.maximum, 1);
      return 1;
    }
    case "boolean":
      return false;
    case "string":
      return sampleString(s);
    default:
      return null;
  }
}

function sampleString(s: JsonSchema): string {
  switch (s.format) {
    case "uuid":
      return "0b4f7c7e-3a51-4c2e-9d7a-5f1e2b3c4d5e";
    case "email":
      return "someone@example.org";
    case "date":
      return "2026-12-02";
    case "date-time":
      return "2026-12-02T09:00:00.000Z";
    case "binary":
      return "(file)";
  }
  const min = Number(s.minLength ?? 1);
  if (typeof s.pattern === "string") {
    const re = new RegExp(s.pattern, "u");
    const hit = PATTERN_SAMPLES.find((x) => re.test(x));
    if (hit) return hit;
  }
  const max = typeof s.maxLength === "number" ? s.maxLength : Infinity;
  const base = "sample".padEnd(min, "x");
  return base.slice(0, Math.max(min, Math.min(base.length, max)));
}
