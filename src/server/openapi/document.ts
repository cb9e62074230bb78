import "server-only";
import { z } from "zod";
import { registry, type RegistryActor } from "@/server/registry";
import { errorCodes } from "@/server/errors";
import { jsonSchemaOf, type JsonSchema } from "./json-schema";
import { minimalExample } from "./example";
import { apiOperations } from "./operations";
import { registryIdOf, type ApiAuth, type ApiOperation } from "./types";

/** The error body every route answers with (src/server/errors.ts, toPublicError). */
export const ErrorBody = z.object({
  error: z.string().describe("What is wrong and where, in a sentence for a person."),
  code: z.enum(Object.keys(errorCodes) as [string, ...string[]]),
  details: z
    .array(
      z.object({
        line: z.number().int().optional(),
        well: z.string().optional(),
        record: z.number().int().optional(),
        field: z.string().optional(),
        message: z.string(),
      }),
    )
    .optional()
    .describe("One entry per refused field, when the body or query was refused."),
});

export const CALLER_LABELS: Record<RegistryActor, string> = {
  signedOut: "anyone, signed out",
  nonMember: "any signed-in person",
  viewer: "campaign viewers",
  chemist: "chemists",
  assay: "assay scientists",
  lead: "project leads",
  admin: "admins",
};

/** Who may call a route, in words, from its registry entry (the one place that says it). */
export function callersOf(allow: readonly RegistryActor[]): string {
  if (allow.includes("signedOut")) return "Anyone (no sign-in).";
  if (allow.includes("nonMember")) return "Any signed-in person.";
  return `${allow.map((a) => CALLER_LABELS[a]).join(", ")}.`.replace(/^./, (c) => c.toUpperCase());
}

const TAGS: [prefix: RegExp, tag: string][] = [
  [/^\/api\/(health|openapi\.json)$/, "Service"],
  [/^\/api\/(me|tokens)/, "Account"],
  [/^\/api\/audit/, "Audit log"],
  [/^\/api\/compound-imports/, "Compound imports"],
  [/^\/api\/compounds/, "Compounds"],
  [/^\/api\/libraries/, "Libraries"],
  [/^\/api\/campaigns\/\{campaignId\}\/plate-maps/, "Plate maps"],
  [/^\/api\/campaigns\/\{campaignId\}\/plate-(runs|batches)/, "Plate runs"],
  [/^\/api\/campaigns\/\{campaignId\}\/experiments/, "Experiments and analyses"],
  [/^\/api\/campaigns\/\{campaignId\}\/hits/, "Hits"],
  [/^\/api\/campaigns\/\{campaignId\}\/(team|members|invitations)/, "Team"],
  [/^\/api\/campaigns\/\{campaignId\}\/digest/, "Digest"],
  [/^\/api\/campaigns/, "Campaigns"],
];

export function tagOf(path: string): string {
  return TAGS.find(([re]) => re.test(path))?.[1] ?? "Other";
}

export type ParameterObject = {
  name: string;
  in: "path" | "query";
  required: boolean;
  description?: string;
  schema: JsonSchema;
};

/** Path parameters from the template; their schema from the route's own validator where it has one. */
export function parametersOf(op: ApiOperation): ParameterObject[] {
  const out: ParameterObject[] = [];
  const pathSchema = op.params ? jsonSchemaOf(op.params) : null;
  for (const [, name] of op.path.matchAll(/\{([^}]+)\}/g)) {
    const own = (pathSchema?.properties as Record<string, JsonSchema> | undefined)?.[name!];
    out.push({ name: name!, in: "path", required: true, schema: own ?? { type: "string" } });
  }
  if (op.query) {
    const q = jsonSchemaOf(op.query);
    const required = new Set((q.required ?? []) as string[]);
    for (const [name, schema] of Object.entries((q.properties ?? {}) as Record<string, JsonSchema>)) {
      out.push({ name, in: "query", required: required.has(name), schema });
    }
  }
  return out;
}

export function requestBodyOf(op: ApiOperation) {
  if (!op.body) return undefined;
  const schema = jsonSchemaOf(op.body.schema);
  const mediaType = op.body.kind === "json" ? "application/json" : "multipart/form-data";
  return {
    required: true,
    content: { [mediaType]: { schema, example: op.body.example ?? minimalExample(schema) } },
  };
}

const errorRef = { $ref: "#/components/schemas/Error" };
const errorAnswer = (description: string) => ({ description, content: { "application/json": { schema: errorRef } } });

function responsesOf(op: ApiOperation, auth: ApiAuth) {
  const out: Record<string, unknown> = {};
  for (const [status, r] of Object.entries(op.responses)) {
    const type = r.contentType ?? "application/json";
    out[status] =
      Number(status) === 304
        ? { description: r.description }
        : {
            description: r.description,
            content: { [type]: r.schema ? { schema: jsonSchemaOf(r.schema, "output") } : {} },
          };
  }
  if (op.body || op.query || op.params)
    out["400"] ??= errorAnswer("The request was refused; `error` says what and where.");
  if (auth !== "public") out["401"] ??= errorAnswer("Not signed in, or the token is unknown, expired or revoked.");
  if (auth !== "public")
    out["403"] ??= errorAnswer("Signed in, but the role (or the token's scope) does not allow this.");
  if (op.path.includes("{"))
    out["404"] ??= errorAnswer("No such thing, or the caller is not a member of its campaign.");
  out["429"] ??= errorAnswer("Too many requests; try again after `retry-after` seconds.");
  return out;
}

const SECURITY = {
  public: [],
  session: [{ sessionCookie: [] }],
  any: [{ sessionCookie: [] }, { bearerAuth: [] }],
} as const;

/**
 * The OpenAPI 3.1 document of the JSON API, built from `apiOperations` and the registry. Contains
 * shapes and roles only: no data, no secrets, no server addresses beyond the relative root.
 */
export function buildOpenApiDocument(operations: ApiOperation[] = apiOperations) {
  const allow = new Map(registry.map((e) => [e.id, e]));
  const paths: Record<string, Record<string, unknown>> = {};
  const tags = new Set<string>();
  for (const op of operations) {
    const id = registryIdOf(op);
    const entry = allow.get(id);
    const tag = tagOf(op.path);
    tags.add(tag);
    const who = entry ? callersOf(entry.allow) : "Not in the registry.";
    const parameters = parametersOf(op);
    // The registry says which routes refuse personal tokens (e.g. minting one); an operation may say so itself.
    const auth: ApiAuth =
      op.auth ?? ((entry as { sessionOnly?: boolean } | undefined)?.sessionOnly ? "session" : "any");
    const scope = op.method === "GET" ? "read" : "read-write";
    const tokenNote =
      auth === "any"
        ? scope === "read"
          ? "Personal tokens: a `read` or `read-write` token."
          : "Personal tokens: a `read-write` token (a `read` token is refused)."
        : auth === "session"
          ? "Browser session only; tokens are refused."
          : "";
    (paths[op.path] ??= {})[op.method.toLowerCase()] = {
      operationId: `${op.method.toLowerCase()}${op.path
        .replace(/^\/api/, "")
        .replace(/\{([^}]+)\}/g, "by-$1")
        .split(/[/.\-]/)
        .filter(Boolean)
        .map((w) => w[0]!.toUpperCase() + w.slice(1))
        .join("")}`,
      summary: op.summary,
      description: [op.description, tokenNote, `Who may call: ${who}`].filter(Boolean).join("\n\n"),
      tags: [tag],
      security: SECURITY[auth],
      ...(parameters.length ? { parameters } : {}),
      ...(op.body ? { requestBody: requestBodyOf(op) } : {}),
      responses: responsesOf(op, auth),
      "x-registry-id": id,
      "x-callers": entry ? [...entry.allow] : [],
      ...(auth === "any" ? { "x-token-scope": scope } : {}),
    };
  }
  return {
    openapi: "3.1.0",
    jsonSchemaDialect: "https://json-schema.org/draft/2020-12/schema",
    info: {
      title: "Inhibitrack API",
      version: "1",
      description:
        "The JSON API of Inhibitrack. Every request is checked for the caller and their role on the server. " +
        "Results are for research use and need review by a qualified scientist; handle chemicals per their " +
        "safety data sheets and local rules.",
    },
    servers: [{ url: "/" }],
    tags: [...tags].map((name) => ({ name })),
    paths,
    components: {
      schemas: { Error: jsonSchemaOf(ErrorBody, "output") },
      securitySchemes: {
        sessionCookie: {
          type: "apiKey",
          in: "cookie",
          name: "inhibitrack_session",
          description: "The browser session set by signing in. Writes also need a same-origin Origin header.",
        },
        bearerAuth: {
          type: "http",
          scheme: "bearer",
          description:
            "A personal API token (Settings → API tokens) as `Authorization: Bearer <token>`. A read token never writes.",
        },
      },
    },
  };
}

export type OpenApiDocument = ReturnType<typeof buildOpenApiDocument>;
