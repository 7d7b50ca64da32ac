import type { FieldErrors } from "@/lib/errors";

/**
 * What every server action returns to its form: the result, or every field's error and a message.
 * Actions are written with action({ roles, schema }, fn) in lib/http/action.ts; this type lives here,
 * outside server-only code, so that forms can name it.
 */
export type ActionResult<T = undefined> =
  | { ok: true; data: T; message?: string }
  | { ok: false; message: string; fieldErrors?: FieldErrors };
