/**
 * The API document against the routes it describes. Outside reference: the published OpenAPI 3.1
 * schema (spec.openapis.org, as bundled by @seriousme/openapi-schema-validator) for the structure;
 * zod 4's own JSON Schema (draft 2020-12) output for the request schemas; the route files and the
 * registry (src/server/registry.ts) for the list of operations.
 */
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { Validator } from "@seriousme/openapi-schema-validator";
import { registry } from "@/server/registry";
import { apiOperations, buildOpenApiDocument, registryIdOf, type ApiOperation } from ".";
import { jsonSchemaOf, type JsonSchema } from "./json-schema";
import { minimalExample } from "./example";

const doc = buildOpenApiDocument();
type Op = {
  parameters?: { name: string; in: string; required: boolean; schema: JsonSchema }[];
  requestBody?: { content: Record<string, { schema: JsonSchema; example: unknown }> };
  "x-registry-id": string;
};
const docOps = Object.entries(doc.paths).flatMap(([p, methods]) =>
  Object.entries(methods).map(([m, op]) => ({ key: `${m.toUpperCase()} ${p}`, op: op as Op })),
);
const opOf = (o: ApiOperation) => doc.paths[o.path]![o.method.toLowerCase()] as Op;
const label = (o: ApiOperation) => `${o.method} ${o.path}`;

describe("API document ↔ registry", () => {
  it("every API route in the registry is in the document, and every document operation is in the registry", () => {
    const apiIds = registry.map((e) => e.id).filter((id) => id.startsWith("src/app/api/"));
    const documented = docOps.map((d) => d.op["x-registry-id"]);
    expect(
      apiIds.filter((id) => !documented.includes(id)),
      "registry routes missing from src/server/openapi/operations.ts",
    ).toEqual([]);
    expect(
      documented.filter((id) => !apiIds.includes(id)),
      "document operations with no registry entry",
    ).toEqual([]);
    expect(new Set(documented).size, "an operation listed twice").toBe(apiOperations.length);
  });

  it("each operation's route file exists and exports its method", () => {
    for (const o of apiOperations) {
      const [file, method] = registryIdOf(o).split("#") as [string, string];
      expect(fs.existsSync(file), file).toBe(true);
      expect(fs.readFileSync(file, "utf8"), registryIdOf(o)).toMatch(new RegExp(`export\\s+const\\s+${method}\\b`));
    }
  });
});

/** The named imports of a route file from a sibling or parent `schema.ts`, resolved to their modules. */
async function schemaImports(routeFile: string): Promise<{ name: string; value: unknown }[]> {
  const src = fs.readFileSync(routeFile, "utf8");
  const out: { name: string; value: unknown }[] = [];
  for (const m of src.matchAll(/import\s*\{([^}]+)\}\s*from\s*"((?:\.\.?\/)+schema)"/g)) {
    const mod = (await import(path.resolve(path.dirname(routeFile), `${m[2]}.ts`))) as Record<string, unknown>;
    for (const spec of m[1]!
      .split(",")
      .map((s) => s.trim())
      .filter(Boolean)) {
      const [name, local] = spec.split(/\s+as\s+/) as [string, string | undefined];
      const used = src.split(new RegExp(`\\b${local ?? name}\\b`)).length - 1;
      if (used >= 2) out.push({ name: local ?? name, value: mod[name] });
    }
  }
  return out;
}

/** A JSON example as the validator receives it: query values as strings, multipart files as File. */
function asReceived(o: ApiOperation, where: "body" | "query", v: unknown, schema: JsonSchema): unknown {
  if (!v || typeof v !== "object" || Array.isArray(v)) return v;
  const props = (schema.properties ?? {}) as Record<string, JsonSchema>;
  const out: Record<string, unknown> = {};
  for (const [k, x] of Object.entries(v)) {
    const file = () => new File(["invented,example\n"], "invented.csv", { type: "text/csv" });
    const items = props[k]?.items as JsonSchema | undefined;
    if (where === "body" && o.body?.kind === "multipart" && props[k]?.format === "binary") out[k] = file();
    else if (where === "body" && o.body?.kind === "multipart" && items?.format === "binary")
      out[k] = Array.isArray(x) ? x.map(file) : file();
    else if (where === "query" || o.body?.kind === "multipart") out[k] = String(x);
    else out[k] = x;
  }
  return out;
}

/** Values the JSON Schema refuses, made from a valid example one rule at a time. */
function invalidVariants(valid: Record<string, unknown>, s: JsonSchema): [string, unknown][] {
  const out: [string, unknown][] = [["an array instead of an object", []]];
  const props = (s.properties ?? {}) as Record<string, JsonSchema>;
  for (const key of (s.required ?? []) as string[]) {
    const { [key]: _dropped, ...rest } = valid;
    out.push([`without required ${key}`, rest]);
  }
  for (const [key, p] of Object.entries(props)) {
    if (Array.isArray(p.enum)) out.push([`${key} outside its enum`, { ...valid, [key]: "not-one-of-them" }]);
    if (typeof p.maxLength === "number" && p.maxLength < 100_000)
      out.push([`${key} over maxLength`, { ...valid, [key]: "x".repeat(p.maxLength + 1) }]);
    if (typeof p.maximum === "number") out.push([`${key} over maximum`, { ...valid, [key]: p.maximum + 1 }]);
    if (typeof p.minimum === "number") out.push([`${key} under minimum`, { ...valid, [key]: p.minimum - 1 }]);
    if (p.format === "uuid") out.push([`${key} not a uuid`, { ...valid, [key]: "not-a-uuid" }]);
  }
  return out;
}

describe("API document ↔ the routes' own validators", () => {
  for (const o of apiOperations.filter((x) => x.body || x.query || x.params)) {
    const file = registryIdOf(o).split("#")[0]!;
    const validators = [
      o.body && { where: "body" as const, schema: o.body.schema },
      o.query && { where: "query" as const, schema: o.query as z.ZodType },
      o.params && { where: "params" as const, schema: o.params as z.ZodType },
    ].filter((x) => !!x);

    it(`${label(o)}: its schemas are the ones the route imports from schema.ts and uses`, async () => {
      const imported = await schemaImports(file);
      for (const v of validators)
        expect(
          imported.some((i) => i.value === v.schema),
          `${label(o)} ${v.where}: not a schema.ts export that ${file} imports and uses`,
        ).toBe(true);
    });

    it(`${label(o)}: the document's schemas are the JSON Schema of the route's validators`, () => {
      const op = opOf(o);
      if (o.body) {
        const content = Object.values(op.requestBody!.content)[0]!;
        expect(content.schema).toEqual(jsonSchemaOf(o.body.schema));
      }
      for (const where of ["query", "params"] as const) {
        const zs = where === "query" ? o.query : o.params;
        if (!zs) continue;
        const js = jsonSchemaOf(zs);
        const inDoc = (op.parameters ?? []).filter((p) => p.in === (where === "query" ? "query" : "path"));
        const props = js.properties as Record<string, JsonSchema>;
        for (const p of inDoc) if (props[p.name]) expect(p.schema, `${where} ${p.name}`).toEqual(props[p.name]);
        if (where === "query") {
          expect(inDoc.map((p) => p.name).sort()).toEqual(Object.keys(props).sort());
          expect(inDoc.filter((p) => p.required).map((p) => p.name)).toEqual(((js.required ?? []) as string[]).sort());
        }
      }
    });

    if (o.body || o.query) {
      it(`${label(o)}: the example passes the route's validator and broken ones are refused`, () => {
        const op = opOf(o);
        const where = o.body ? ("body" as const) : ("query" as const);
        const zs = (o.body?.schema ?? o.query) as z.ZodType;
        const js = jsonSchemaOf(zs);
        const example = where === "body" ? Object.values(op.requestBody!.content)[0]!.example : minimalExample(js);
        const ok = zs.safeParse(asReceived(o, where, example, js));
        expect(ok.success, `${label(o)} example ${JSON.stringify(example)}: ${ok.error?.message}`).toBe(true);
        for (const [why, bad] of invalidVariants(example as Record<string, unknown>, js)) {
          const r = zs.safeParse(asReceived(o, where, bad, js));
          expect(r.success, `${label(o)}: a ${where} ${why} should be refused`).toBe(false);
        }
      });
    }
  }
});

describe("API document structure", () => {
  it("is valid OpenAPI 3.1 by the published schema", async () => {
    const v = new Validator();
    const r = await v.validate(JSON.parse(JSON.stringify(doc)));
    expect(r.errors ?? [], JSON.stringify(r.errors, null, 1)?.slice(0, 2000)).toEqual([]);
    expect(r.valid).toBe(true);
    expect(v.version).toBe("3.1");
  });

  it("has unique operation ids, declares every path parameter and names a security scheme that exists", () => {
    const ids = docOps.map((d) => (d.op as unknown as { operationId: string }).operationId);
    expect(new Set(ids).size).toBe(ids.length);
    for (const { key, op } of docOps) {
      const inPath = [...key.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]);
      const declared = (op.parameters ?? []).filter((p) => p.in === "path").map((p) => p.name);
      expect(declared, key).toEqual(inPath);
      for (const req of (op as unknown as { security: Record<string, unknown>[] }).security)
        for (const name of Object.keys(req)) expect(Object.keys(doc.components.securitySchemes)).toContain(name);
    }
  });

  it("holds no secrets or addresses", () => {
    const text = JSON.stringify(doc);
    expect(text).not.toMatch(/postgres:\/\/|password=|AKIA|re_[A-Za-z0-9]{16}|127\.0\.0\.1|localhost/);
  });
});
