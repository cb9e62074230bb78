import "server-only";
import { z } from "zod";
import { AppError, isNextControlFlow, toPublicError } from "./errors";

export type ActionState<T = unknown> =
  | { ok: true; data?: T; message?: string }
  | { ok: false; error: string; fieldErrors?: Record<string, string>; status?: number }
  | null;

/**
 * Every server action goes through here: the form is parsed with zod (numbers with z.coerce),
 * then the handler runs — it calls the guard before anything else — and errors come back as a
 * sentence for the form, never a stack. Server actions are public endpoints; Next.js itself
 * refuses an action whose Origin does not match the host.
 */
export function formAction<S extends z.ZodType, T>(
  schema: S,
  fn: (input: z.infer<S>) => Promise<ActionState<T> | void>,
) {
  return async (_prev: ActionState<T>, form: FormData): Promise<ActionState<T>> => {
    const raw: Record<string, unknown> = {};
    for (const [k, v] of form.entries()) {
      if (k.startsWith("$ACTION")) continue;
      if (k in raw) raw[k] = ([] as unknown[]).concat(raw[k], v);
      else raw[k] = v;
    }
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
