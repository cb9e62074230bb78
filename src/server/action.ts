import "server-only";
import { z } from "zod";
import { AppError, isNextControlFlow, toPublicError } from "./errors";
import { fieldProblem } from "./edge-input";

export type ActionState<T = unknown> =
  | { ok: true; data?: T; message?: string }
  | { ok: false; error: string; fieldErrors?: Record<string, string>; status?: number }
  | null;

/**
 * Every server action goes through here: each text field passes the edge rules
 * (src/server/edge-input.ts: no NUL, well-formed text, UUID ids, bounded numbers and dates), the
 * form is parsed with zod (numbers with z.coerce), then the handler runs — it calls the guard before anything else — and errors come back as a
 * sentence for the form, never a stack. Server actions are public endpoints; Next.js itself
 * refuses an action whose Origin does not match the host.
 */
export function formAction<S extends z.ZodType, T>(
  schema: S,
  fn: (input: z.infer<S>) => Promise<ActionState<T> | void>,
) {
  return async (_prev: ActionState<T>, form: FormData): Promise<ActionState<T>> => {
    const raw: Record<string, unknown> = {};
    const refused: Record<string, string> = {};
    for (const [k, v] of form.entries()) {
      if (k.startsWith("$ACTION")) continue;
      const problem = typeof v === "string" ? fieldProblem(k, v) : null;
      if (problem) refused[k.slice(0, 60)] ??= problem;
      if (k in raw) raw[k] = ([] as unknown[]).concat(raw[k], v);
      else raw[k] = v;
    }
    const firstRefused = Object.values(refused)[0];
    if (firstRefused) return { ok: false, error: firstRefused, fieldErrors: refused, status: 400 };
    const parsed = schema.safeParse(raw);
    if (!parsed.success) {
      const fieldErrors: Record<string, string> = {};
      for (const i of parsed.error.issues) fieldErrors[i.path.join(".") || "_"] ??= i.message;
      return { ok: false, error: "Please correct the highlighted fields.", fieldErrors, status: 400 };
    }
    try {
      return (await fn(parsed.data)) ?? { ok: true };
    } catch (e) {
      if (isNextControlFlow(e)) throw e;
      const { status, body } = toPublicError(e);
      return { ok: false, error: body.error, status };
    }
  };
}

export { AppError };
