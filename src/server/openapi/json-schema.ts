import "server-only";
import { z } from "zod";

/** A JSON Schema (2020-12) object, as zod writes it. */
export type JsonSchema = Record<string, unknown>;

/**
 * The JSON Schema (draft 2020-12, the dialect of OpenAPI 3.1) of a route's zod validator, by zod 4's
 * own `z.toJSONSchema`. Requests are described as their input (`io: "input"`): what a client may
 * send, before defaults and transforms run; responses as their output. A file field
 * (`z.instanceof(File)`) becomes `{ type: "string", format: "binary" }`, the OpenAPI 3.1 way of
 * naming a multipart file part; transforms and refinements JSON Schema cannot express are left
 * to the validator (the document says so in the operation's description where it matters).
 */
export function jsonSchemaOf(schema: z.ZodType, io: "input" | "output" = "input"): JsonSchema {
  const out = z.toJSONSchema(schema, {
    target: "draft-2020-12",
    io,
    unrepresentable: "any",
    override: (ctx) => {
      const def = (ctx.zodSchema as unknown as { _zod: { def: { type: string } } })._zod.def;
      if (def.type === "custom") {
        ctx.jsonSchema.type = "string";
        ctx.jsonSchema.format = "binary";
      }
    },
  }) as JsonSchema;
  // The dialect is declared once for the whole document (jsonSchemaDialect).
  delete out.$schema;
  return out;
}
