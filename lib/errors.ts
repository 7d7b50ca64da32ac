// Errors that lib/ raises for a person to act on. Route handlers and server actions turn them into
// answers (lib/http/route.ts, lib/http/action.ts); anything else is a bug and a 500.

import { formatRetryWait } from "@/lib/format/dates";
import { formatBytes } from "@/lib/format/units";

export type FieldErrors = Record<string, string[]>;

// Build these with the constructors below (one per status), never with `new AppError` elsewhere:
// one place says which codes and texts each status has.
export class AppError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429 | 503,
    readonly code: string,
    message: string,
    readonly fieldErrors?: FieldErrors,
    readonly retryAfterSec?: number,
    /** Fields answered beside `error` in the JSON body (a refused booking's fresh free times). */
    readonly extra?: Record<string, unknown>,
  ) {
    super(message);
    this.name = "AppError";
  }
}

/** Input that does not pass its schema; `code` names a case a client tells apart (`out_of_range`). */
export const badRequest = (message: string, fieldErrors?: FieldErrors, code = "bad_request") => new AppError(400, code, message, fieldErrors);
export const unauthorized = (message = "Sign in to continue.") => new AppError(401, "unauthorized", message);
export const forbidden = (message = "You don't have access to this.") => new AppError(403, "forbidden", message);
/** Also used for someone else's data, so a stranger cannot tell that it exists. */
export const notFound = (message = "Not found.") => new AppError(404, "not_found", message);
/**
 * The request clashes with what is stored or with another party's answer (a taken e-mail, a taken
 * time, a payment the provider refused); `code` names the case, `extra` goes beside the error.
 */
export const conflict = (message: string, opts: { code?: string; fieldErrors?: FieldErrors; extra?: Record<string, unknown> } = {}) =>
  new AppError(409, opts.code ?? "conflict", message, opts.fieldErrors, undefined, opts.extra);
/** A request body over its route's limit (lib/http/body.ts); `limitBytes` is the limit a person can act on. */
export const payloadTooLarge = (limitBytes: number) =>
  new AppError(413, "payload_too_large", `That is too large: we take up to ${formatBytes(limitBytes)} at a time. Send a smaller one.`);
/** A body or file of a kind this place does not take; the message says what to send instead. */
export const unsupportedMediaType = (whatToSend: string) => new AppError(415, "unsupported_media_type", whatToSend);
/** Well-formed input that cannot be used as it is (a damaged image, a date out of range); `code` names the case. */
export const unprocessable = (code: string, message: string, fieldErrors?: FieldErrors) => new AppError(422, code, message, fieldErrors);
export const tooManyRequests = (retryAfterSec: number, message?: string) =>
  new AppError(
    429,
    "rate_limited",
    message ?? `Too many attempts. Try again in ${formatRetryWait(retryAfterSec)}.`,
    undefined,
    retryAfterSec,
  );

/** A service we depend on cannot be reached; nothing of ours changed, so trying again later is safe. */
export const serviceUnavailable = (code: string, message: string) => new AppError(503, code, message);

/** The same error (status, code, wait) told in other words, e.g. with what the caller had already done. */
export const rephrased = (e: AppError, message: string, fieldErrors: FieldErrors | undefined = e.fieldErrors) =>
  new AppError(e.status, e.code, message, fieldErrors, e.retryAfterSec, e.extra);

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}
