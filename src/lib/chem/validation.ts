/**
 * zod schemas for the compound register form, `POST /api/compounds` and each bulk-import record.
 *
 * Shape: `{ smiles?, molfile?, name?, aliases?, batch?: {...}, stock?: {...}, distinctReason? }`
 * with exactly one of `smiles` / `molfile`. The schemas check form and ranges only; whether the
 * structure is chemistry is `parse.ts`'s job (the server runs both and answers 400 with the
 * parse message).
 *
 * Numbers accept strings (`z.coerce`, for HTML forms); an empty string means "not given".
 * Free text is trimmed, and text a spreadsheet could run as a formula (starting with = + - @, tab
 * or carriage return and not a plain number; OWASP "CSV Injection") is refused, so that exports
 * of the registry stay safe to open.
 */
import { z } from "zod";
import { formulaInjectionMessage } from "@/lib/plates/cells";

/** Units a batch amount may carry. `ug`/`mcg`/`uL` are accepted and normalised to µ. */
export const AMOUNT_UNITS = ["µg", "mg", "g", "µL", "mL"] as const;
export type AmountUnit = (typeof AMOUNT_UNITS)[number];

const UNIT_ALIASES: Record<string, AmountUnit> = {
  ug: "µg",
  mcg: "µg",
  μg: "µg", // Greek mu (U+03BC) → micro sign (U+00B5)
  µg: "µg",
  mg: "mg",
  g: "g",
  ul: "µL",
  μl: "µL",
  µl: "µL",
  ml: "mL",
};

export function normaliseAmountUnit(raw: string): AmountUnit | undefined {
  return UNIT_ALIASES[raw.trim().toLowerCase()];
}

const blankToUndefined = (v: unknown) =>
  v === "" || v === null || (typeof v === "string" && v.trim() === "") ? undefined : v;

/** Required text, max `max` characters, refusing formula-like text; trimmed after the check. */
export function safeTextRequired(max: number) {
  return z
    .string()
    .max(max, `Use at most ${max} characters.`)
    .superRefine((value, ctx) => {
      const msg = formulaInjectionMessage(value);
      if (msg) ctx.addIssue({ code: "custom", message: `${msg}.` });
    })
    .transform((v) => v.trim());
}

/** Optional text: like safeTextRequired, and blank means "not given". */
export function safeText(max: number) {
  return z.preprocess(blankToUndefined, safeTextRequired(max).optional());
}

function optionalNumber(min: number, max: number, what: string, { exclusiveMin = false } = {}) {
  const base = z.coerce
    .number({ error: `${what} must be a number.` })
    .refine(Number.isFinite, `${what} must be a number.`);
  const ranged = exclusiveMin
    ? base.refine((n) => n > min && n <= max, `${what} must be greater than ${min} and at most ${max}.`)
    : base.refine((n) => n >= min && n <= max, `${what} must be between ${min} and ${max}.`);
  return z.preprocess(blankToUndefined, ranged.optional());
}

const isoDate = z.preprocess(
  blankToUndefined,
  z
    .string()
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date like 2025-03-14.")
    .refine(
      (s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s),
      "Not a calendar date.",
    )
    .optional(),
);

export const amountUnitSchema = z.preprocess(
  (v) => (typeof v === "string" ? (v.trim() === "" ? undefined : (normaliseAmountUnit(v) ?? v)) : v),
  z.enum(AMOUNT_UNITS, { error: `Amount unit must be one of ${AMOUNT_UNITS.join(", ")}.` }).optional(),
);

export const batchSchema = z
  .object({
    supplier: safeText(200),
    /** Purity in %, 0–100. */
    purityPct: optionalNumber(0, 100, "Purity (%)"),
    amount: optionalNumber(0, 1e6, "Amount", { exclusiveMin: true }),
    amountUnit: amountUnitSchema,
    /** Salt or solvate form as text, e.g. "HCl", "TFA salt", "hydrate". */
    saltForm: safeText(100),
    /** Date received or made, YYYY-MM-DD. */
    date: isoDate,
    notes: safeText(2000),
  })
  .superRefine((b, ctx) => {
    if (b.amount !== undefined && b.amountUnit === undefined) {
      ctx.addIssue({ code: "custom", path: ["amountUnit"], message: "Give the unit of the amount." });
    }
  });
export type BatchInput = z.infer<typeof batchSchema>;

export const stockSchema = z.object({
  /** Concentration in mM; 10 mM is common practice for screening stocks. */
  concentrationMm: optionalNumber(0, 1000, "Stock concentration (mM)", { exclusiveMin: true }),
  solvent: safeText(60),
  volumeUl: optionalNumber(0, 1e6, "Stock volume (µL)", { exclusiveMin: true }),
  /** Free text such as "Freezer 2 / Rack B / A07". */
  location: safeText(200),
  /** Date made, YYYY-MM-DD. */
  date: isoDate,
});
export type StockInput = z.infer<typeof stockSchema>;

const smilesField = z.preprocess(
  blankToUndefined,
  z.string().trim().max(2000, "SMILES is longer than 2000 characters.").optional(),
);
const molfileField = z.preprocess(
  blankToUndefined,
  z.string().max(1_000_000, "Molfile is larger than 1,000,000 characters.").optional(),
);

/** Aliases as an array, or one string separated by semicolons (as in import files). */
export const aliasesSchema = z.preprocess(
  (v) =>
    typeof v === "string"
      ? v
          .split(";")
          .map((s) => s.trim())
          .filter((s) => s !== "")
      : v,
  z.array(safeTextRequired(100)).max(20, "At most 20 aliases.").optional(),
);

const compoundFields = {
  smiles: smilesField,
  molfile: molfileField,
  name: safeText(200),
  aliases: aliasesSchema,
  batch: batchSchema.optional(),
  stock: stockSchema.optional(),
};

function exactlyOneStructure(v: { smiles?: string | undefined; molfile?: string | undefined }, ctx: z.RefinementCtx) {
  if (v.smiles === undefined && v.molfile === undefined) {
    ctx.addIssue({ code: "custom", path: ["smiles"], message: "Give a structure: a SMILES or a molfile." });
  }
  if (v.smiles !== undefined && v.molfile !== undefined) {
    ctx.addIssue({ code: "custom", path: ["smiles"], message: "Give either a SMILES or a molfile, not both." });
  }
}

/** Register form and API body. `distinctReason`: why a structure that matches an existing one is registered anew. */
export const registerCompoundSchema = z
  .object({ ...compoundFields, distinctReason: safeText(500) })
  .superRefine(exactlyOneStructure);
export type RegisterCompoundInput = z.infer<typeof registerCompoundSchema>;

/** One record of a bulk import (same fields, no distinctReason: duplicates need the form). */
export const importRecordSchema = z.object(compoundFields).superRefine(exactlyOneStructure);
export type ImportRecordInput = z.infer<typeof importRecordSchema>;

/** zod issues as `{ field, message }`, field as a dotted path (`batch.purityPct`). */
export function zodFieldErrors(error: z.ZodError): { field: string; message: string }[] {
  return error.issues.map((i) => ({ field: i.path.map(String).join(".") || "record", message: i.message }));
}
