// Errors that lib/ raises for a person to act on. Route handlers and server actions turn them into
// answers (lib/http/route.ts, lib/validation/action.ts); anything else is a bug and a 500.

export type FieldErrors = Record<string, string[]>;

export class AppError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429 | 503,
    readonly code: string,
    message: string,
    readonly fieldErrors?: FieldErrors,
    readonly retryAfterSec?: number,
  ) {
    super(message);
    this.name = "AppError";
  }
}

export const badRequest = (message: string, fieldErrors?: FieldErrors) =>
  new AppError(400, "bad_request", message, fieldErrors);
export const unauthorized = (message = "Sign in to continue.") => new AppError(401, "unauthorized", message);
export const forbidden = (message = "You don't have access to this.") => new AppError(403, "forbidden", message);
/** Also used for someone else's data, so a stranger cannot tell that it exists. */
export const notFound = (message = "Not found.") => new AppError(404, "not_found", message);
export const conflict = (message: string) => new AppError(409, "conflict", message);
/** A request body over its route's limit (lib/http/body.ts); `limitBytes` is the limit a person can act on. */
export const payloadTooLarge = (limitBytes: number) =>
  new AppError(413, "payload_too_large", `That is too large: we take up to ${formatSize(limitBytes)} at a time. Send a smaller one.`);
/** A body or file of a kind this place does not take; the message says what to send instead. */
export const unsupportedMediaType = (whatToSend: string) => new AppError(415, "unsupported_media_type", whatToSend);
/** Well-formed input that cannot be used as it is (a damaged image, a date out of range); `code` names the case. */
export const unprocessable = (code: string, message: string, fieldErrors?: FieldErrors) => new AppError(422, code, message, fieldErrors);
export const tooManyRequests = (retryAfterSec: number, message?: string) =>
  new AppError(
    429,
    "rate_limited",
    message ?? `Too many attempts. Try again in ${formatWait(retryAfterSec)}.`,
    undefined,
    retryAfterSec,
  );

function formatSize(bytes: number): string {
  const mb = bytes / (1024 * 1024);
  return mb >= 1 ? `${Math.floor(mb)} MB` : `${Math.max(1, Math.floor(bytes / 1024))} KB`;
}

function formatWait(sec: number): string {
  if (sec < 90) return `${Math.max(1, Math.ceil(sec))} seconds`;
  return `${Math.ceil(sec / 60)} minutes`;
}

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}
