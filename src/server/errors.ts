import "server-only";
import { ZodError } from "zod";

/**
 * One place that maps an error code to an HTTP status and says whether its message is shown to
 * the user. The user sees a sentence; the log sees the stack.
 */
export const errorCodes = {
  unauthorized: { status: 401, shown: true, message: "Please sign in." },
  forbidden: { status: 403, shown: true, message: "Your role in this campaign does not allow this." },
  not_found: { status: 404, shown: true, message: "Not found." },
  bad_request: { status: 400, shown: true, message: "The request is not valid." },
  conflict: { status: 409, shown: true, message: "This conflicts with existing data." },
  too_large: { status: 413, shown: true, message: "The upload is too large." },
  throttled: { status: 429, shown: true, message: "Too many attempts. Please wait a few minutes and try again." },
  bad_origin: { status: 403, shown: true, message: "The request came from another site and was refused." },
  internal: { status: 500, shown: false, message: "Something went wrong on our side. The error has been logged." },
} as const;
export type ErrorCode = keyof typeof errorCodes;

export type ErrorDetail = { line?: number; well?: string; record?: number; field?: string; message: string };

export class AppError extends Error {
  readonly code: ErrorCode;
  readonly details?: ErrorDetail[];
  readonly extra?: Record<string, unknown>;
  constructor(code: ErrorCode, message?: string, opts?: { details?: ErrorDetail[]; extra?: Record<string, unknown> }) {
    super(message ?? errorCodes[code].message);
    this.code = code;
    this.details = opts?.details;
    this.extra = opts?.extra;
  }
  get status() {
    return errorCodes[this.code].status;
  }
}

export function zodDetails(e: ZodError): ErrorDetail[] {
  return e.issues.map((i) => ({ field: i.path.join(".") || undefined, message: i.message }));
}

/**
 * Postgres refusals that bad input causes (SQLSTATE class 22 "data exception" and 54000
 * "program limit exceeded"), each with the sentence the user sees. The edge (route() and
 * formAction()) should refuse such input first; this is the last net, so that a value that slips
 * through gives a 400 and not a 500. Codes from the PostgreSQL manual, appendix A "PostgreSQL
 * Error Codes".
 */
const inputRefusals: Record<string, string> = {
  "22P02": "A value has the wrong form (for example an id that is not a UUID, or text where a number belongs).",
  "22021": "A value contains bytes that are not valid text in UTF-8.",
  "22P05": "A value contains a character that cannot be stored (such as a NUL character).",
  "22008": "A date or time is out of range.",
  "22007": "A date or time has the wrong form.",
  "22003": "A number is out of range.",
  "22001": "A value is too long.",
  "22023": "A value is not valid here.",
  "2201X": "A page or row number is out of range.",
  "2201W": "A limit is out of range.",
  "54000": "A value is too large to be processed.",
};

/** The SQLSTATE of a Postgres error, also when it is wrapped (Drizzle's DrizzleQueryError keeps it as `cause`). */
export function pgErrorCode(e: unknown): string | null {
  for (let cur: unknown = e, depth = 0; cur && depth < 5; depth++) {
    const c = cur as { code?: unknown; severity?: unknown; cause?: unknown };
    if (typeof c.code === "string" && /^[0-9A-Z]{5}$/.test(c.code) && c.severity !== undefined) return c.code;
    cur = c.cause;
  }
  return null;
}

/** Turns anything thrown into what the user may see, logging what they may not. */
export function toPublicError(e: unknown): {
  status: number;
  body: { error: string; code: ErrorCode; details?: ErrorDetail[] } & Record<string, unknown>;
} {
  if (e instanceof AppError) {
    return {
      status: e.status,
      body: { error: e.message, code: e.code, ...(e.details ? { details: e.details } : {}), ...(e.extra ?? {}) },
    };
  }
  if (e instanceof ZodError) {
    const details = zodDetails(e);
    return {
      status: 400,
      body: {
        error: details.map((d) => (d.field ? `${d.field}: ${d.message}` : d.message)).join("; "),
        code: "bad_request",
        details,
      },
    };
  }
  const pg = pgErrorCode(e);
  if (pg && inputRefusals[pg]) {
    // Logged: the edge validation should have refused this input before it reached Postgres.
    console.warn(`[inhibitrack] input refused by Postgres (${pg}); the edge validation let it through`);
    return { status: 400, body: { error: `${inputRefusals[pg]} Please check the request.`, code: "bad_request" } };
  }
  console.error("[inhibitrack] unexpected error", e);
  return { status: 500, body: { error: errorCodes.internal.message, code: "internal" } };
}

/** Next's redirect()/notFound() signal by throwing; they must pass through our wrappers untouched. */
export function isNextControlFlow(e: unknown): boolean {
  const digest = (e as { digest?: unknown } | null)?.digest;
  return (
    typeof digest === "string" &&
    (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR_FALLBACK") || digest === "NEXT_NOT_FOUND")
  );
}
