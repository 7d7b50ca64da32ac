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
export const tooManyRequests = (retryAfterSec: number, message?: string) =>
  new AppError(
    429,
    "rate_limited",
    message ?? `Too many attempts. Try again in ${formatWait(retryAfterSec)}.`,
    undefined,
    retryAfterSec,
  );

function formatWait(sec: number): string {
  if (sec < 90) return `${Math.max(1, Math.ceil(sec))} seconds`;
  return `${Math.ceil(sec / 60)} minutes`;
}

export function isAppError(e: unknown): e is AppError {
  return e instanceof AppError;
}
