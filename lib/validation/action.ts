import { z } from "zod";
import type { FieldErrors } from "@/lib/errors";
import { asAppError } from "./care-input";

/** What every server action returns to its form: the result, or every field's error and a message. */
export type ActionResult<T = undefined> =
  | { ok: true; data: T; message?: string }
  | { ok: false; message: string; fieldErrors?: FieldErrors };

function isNextControlFlow(e: unknown): boolean {
  // redirect() and notFound() throw errors Next.js must see.
  const digest = (e as { digest?: unknown } | null)?.digest;
  return typeof digest === "string" && (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR"));
}

/**
 * Wraps a server action: parses its input with the same zod schema the form uses, runs it, and turns
 * AppErrors into a result the form can show. Every other error is logged and answered generically.
 */
export function validatedAction<S extends z.ZodType, T>(
  schema: S,
  fn: (input: z.output<S>) => Promise<T | ActionResult<T>>,
) {
  return async (raw: z.input<S>): Promise<ActionResult<T>> => {
    const parsed = schema.safeParse(raw);
    if (!parsed.success) {
      const { fieldErrors, formErrors } = z.flattenError(parsed.error);
      return {
        ok: false,
        message: formErrors[0] ?? "Some fields need a second look.",
        fieldErrors: fieldErrors as FieldErrors,
      };
    }
    try {
      const out = await fn(parsed.data);
      if (out && typeof out === "object" && "ok" in out) return out as ActionResult<T>;
      return { ok: true, data: out as T };
    } catch (e) {
      if (isNextControlFlow(e)) throw e;
      const known = asAppError(e);
      if (known) return { ok: false, message: known.message, fieldErrors: known.fieldErrors };
      console.error(e);
      return { ok: false, message: "Something went wrong on our side. Please try again in a moment." };
    }
  };
}
