import { z } from "zod";
import { INHIBITION_MODELS } from "@/lib/kinetics/inhibition-models";

/**
 * The hit grid's query language, shared by the route handlers (which parse it), the grid's
 * datasource and the export link (which build it): one sort field, filters by status,
 * mechanism, flags, hit call, registry ID text, owner, and inclusive min/max ranges on every
 * numeric column. Concentrations are in µM, as everywhere in the API.
 */

export const triageStatuses = ["unreviewed", "confirmed", "advance", "on-hold", "dropped"] as const;
export type TriageStatus = (typeof triageStatuses)[number];
export const triageLabels: Record<TriageStatus, string> = {
  unreviewed: "unreviewed",
  confirmed: "confirmed",
  advance: "advance",
  "on-hold": "on hold",
  dropped: "dropped",
};
/** True for one of the triage statuses (text from a form or an API response). */
export const isTriageStatus = (s: string): s is TriageStatus => triageStatuses.some((x) => x === s);

/** The mechanism filter: the four models, an ambiguous call, or no mechanism result. */
export const mechanismFilterValues = [...INHIBITION_MODELS, "ambiguous", "none"] as const;

/** Sortable fields (API name → meaning). `default` is the ranked order. */
export const sortFields = [
  "default",
  "registryId",
  "mechanism",
  "ki",
  "kic",
  "kiu",
  "alpha",
  "ic50",
  "hill",
  "pctInhibition",
  "le",
  "lipe",
  "mw",
  "clogp",
  "heavyAtoms",
  "flags",
  "status",
  "owner",
  "lastTested",
  "comments",
] as const;
export type SortField = (typeof sortFields)[number];

/** Numeric fields with `<field>Min` / `<field>Max` filters (inclusive). */
export const rangeFields = [
  "ki",
  "kic",
  "kiu",
  "alpha",
  "ic50",
  "hill",
  "pctInhibition",
  "le",
  "lipe",
  "mw",
  "clogp",
  "heavyAtoms",
  "comments",
] as const;
export type RangeField = (typeof rangeFields)[number];

/** The units of the API's numeric fields (the `units` of GET …/hits). */
export const HIT_UNITS = {
  ki: "µM",
  kic: "µM",
  kiu: "µM",
  ic50: "µM",
  pctInhibition: "%",
  le: "kcal/mol per heavy atom",
  mw: "g/mol",
  lipe: "dimensionless",
  alpha: "dimensionless",
} as const satisfies Partial<Record<SortField, string>>;

const list = <T extends readonly [string, ...string[]]>(values: T, what: string) =>
  z
    .string()
    .transform((s) =>
      s
        .split(",")
        .map((x) => x.trim())
        .filter(Boolean)
        .map((x) => (x === "on hold" ? "on-hold" : x)),
    )
    .pipe(
      z.array(
        z.enum(values, { error: () => `${what} must be one or more of: ${values.join(", ")} (comma-separated).` }),
      ),
    );

const num = (field: string) =>
  z
    .string()
    .trim()
    .transform((s, ctx) => {
      const v = Number(s);
      if (s === "" || !Number.isFinite(v)) {
        ctx.addIssue({ code: "custom", message: `${field} must be a number.` });
        return z.NEVER;
      }
      return v;
    });

const bool = (field: string) =>
  z.enum(["true", "false"], { error: () => `${field} must be true or false.` }).transform((s) => s === "true");
const isoDate = (field: string) =>
  z
    .string()
    .refine((s) => !Number.isNaN(Date.parse(s)), { message: `${field} must be a date (YYYY-MM-DD).` })
    .transform((s) => new Date(s));

const rangeShape = Object.fromEntries(
  rangeFields.flatMap((f) => [
    [`${f}Min`, num(`${f}Min`).optional()],
    [`${f}Max`, num(`${f}Max`).optional()],
  ]),
) as Record<`${RangeField}${"Min" | "Max"}`, z.ZodOptional<ReturnType<typeof num>>>;

/** Filters and sort (no paging): what the grid, the API and the export share. */
export const hitFilterSchema = z.object({
  sort: z.enum(sortFields, { error: () => `sort must be one of: ${sortFields.join(", ")}.` }).default("default"),
  dir: z.enum(["asc", "desc"], { error: () => "dir must be asc or desc." }).default("asc"),
  status: list(triageStatuses, "status").optional(),
  mechanism: list(mechanismFilterValues, "mechanism").optional(),
  flagged: bool("flagged").optional(),
  hit: bool("hit").optional(),
  q: z.string().trim().max(100, "q is at most 100 characters.").optional(),
  owner: z.string().trim().max(100, "owner is at most 100 characters.").optional(),
  lastTestedFrom: isoDate("lastTestedFrom").optional(),
  lastTestedTo: isoDate("lastTestedTo").optional(),
  ...rangeShape,
});
export type HitFilter = z.infer<typeof hitFilterSchema>;

export const hitListSchema = hitFilterSchema.extend({
  limit: z.coerce
    .number({ error: () => "limit must be a number." })
    .int("limit must be a whole number.")
    .min(1, "limit is at least 1.")
    .max(500, "limit is at most 500.")
    .default(100),
  offset: z.coerce
    .number({ error: () => "offset must be a number." })
    .int("offset must be a whole number.")
    .min(0, "offset is at least 0.")
    .max(10_000_000)
    .default(0),
});

export const hitExportSchema = hitFilterSchema.extend({
  format: z.enum(["xlsx", "csv"], { error: () => "format must be xlsx or csv." }),
});

/** The raw query parameters of a view (strings, as in the URL), in a stable order. */
export type HitQueryParams = Record<string, string>;

export function hitQueryString(p: HitQueryParams, extra: Record<string, string | number> = {}): string {
  const qs = new URLSearchParams();
  for (const k of Object.keys(p).sort()) if (p[k] !== undefined && p[k] !== "") qs.set(k, p[k]!);
  for (const [k, v] of Object.entries(extra)) qs.set(k, String(v));
  return qs.toString();
}

/** A saved view: the grid's column state plus the query (filters and sort). */
export const savedViewStateSchema = z.object({
  columns: z
    .array(
      z.object({
        colId: z.string().max(40),
        hide: z.boolean().optional().nullable(),
        width: z.number().min(10).max(2000).optional().nullable(),
        pinned: z.enum(["left", "right"]).optional().nullable(),
      }),
    )
    .max(60),
  query: z
    .record(z.string().max(40), z.string().max(400))
    .refine((q) => Object.keys(q).length <= 60, "A view holds at most 60 filters."),
});
export type SavedViewState = z.infer<typeof savedViewStateSchema>;

export const saveViewSchema = z.object({
  name: z.string().trim().min(1, "Name the view.").max(80, "A view name is at most 80 characters."),
  state: savedViewStateSchema,
});

export const triageSchema = z.object({
  status: z.preprocess(
    (s) => (s === "on hold" ? "on-hold" : s),
    z.enum(triageStatuses, { error: () => `status must be one of: ${triageStatuses.join(", ")}.` }),
  ),
  comment: z.string().trim().max(2000, "A comment is at most 2,000 characters.").optional(),
});

export const bulkTriageSchema = triageSchema.extend({
  registryIds: z
    .array(z.string().trim().min(1).max(40))
    .min(1, "Choose at least one compound.")
    .max(5000, "At most 5,000 compounds at once."),
});

export const commentSchema = z.object({
  body: z.string().trim().min(1, "Write a comment.").max(4000, "A comment is at most 4,000 characters."),
});
