"use client";

import type { ActionResult } from "@/lib/validation/action";

// The one way a page in the browser calls our JSON routes. Every route answers an error with
// `{ error: { code, message, fieldErrors? } }` (lib/http/route.ts); here that becomes an ApiError
// carrying the message a person can act on, and the per-field messages for a form.

type FieldErrors = Record<string, string[]>;

/**
 * A refused request: `status` is the HTTP status (0 when the server could not be reached, 400 for a
 * server action's refusal, which has no status of its own), `body` the
 * whole answer, for the routes that send more than the error (fresh free times with a visit's 409,
 * the checked rows of a CSV import).
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly code = "",
    readonly fieldErrors: FieldErrors = {},
    readonly body: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

export const isApiError = (e: unknown): e is ApiError => e instanceof ApiError;

/** RequestInit, plus `json`: a value sent as a JSON body. A string body is taken to be JSON too; a FormData goes as multipart. */
export type ApiInit = Omit<RequestInit, "body"> & { json?: unknown; body?: string | FormData };

const UNREACHABLE = "We couldn't reach the server. Check the connection and try again; nothing you typed is lost.";

/** Calls a route and answers its parsed JSON; a refusal or a dropped connection throws an ApiError. */
export async function apiJson<T>(url: string, init: ApiInit = {}): Promise<T> {
  const { json, body: rawBody, headers: given, ...rest } = init;
  const body = json === undefined ? rawBody : JSON.stringify(json);
  const headers = new Headers(given);
  headers.set("Accept", "application/json");
  if (typeof body === "string" && !headers.has("Content-Type")) headers.set("Content-Type", "application/json");
  let res: Response;
  try {
    res = await fetch(url, { ...rest, headers, body });
  } catch (e) {
    // A cancelled request (a newer search, a page left) stays an abort, so the caller can ignore it.
    if (init.signal?.aborted) throw e;
    throw new ApiError(0, UNREACHABLE);
  }
  const parsed: unknown = await res.json().catch(() => null);
  if (!res.ok) throw errorFrom(res.status, parsed);
  return parsed as T;
}

/** The same call, answered like a server action, so useActionForm can show the field errors. */
export async function callApi<T>(url: string, init: ApiInit = {}): Promise<ActionResult<T>> {
  try {
    return { ok: true, data: await apiJson<T>(url, init) };
  } catch (e) {
    if (!isApiError(e)) throw e;
    return { ok: false, message: e.message, fieldErrors: e.fieldErrors };
  }
}

/**
 * A server action's answer taken like a route's: its data and message on success, an ApiError carrying its
 * message and field messages otherwise, so useRefreshingMutation shows both kinds of call the same way.
 */
export async function actionData<T>(answer: Promise<ActionResult<T>>): Promise<{ data: T; message?: string }> {
  const r = await answer;
  if (!r.ok) throw new ApiError(400, r.message, "", r.fieldErrors ?? {});
  return { data: r.data, message: r.message };
}

/**
 * POSTs a form with XMLHttpRequest, so the upload's progress can be shown (`onProgress` gets 0 to 1).
 * Answers the parsed JSON of a 2xx; anything else rejects with an ApiError.
 */
export function uploadForm<T>(url: string, form: FormData, onProgress: (fraction: number) => void, signal?: AbortSignal): Promise<T> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", url);
    xhr.responseType = "json";
    xhr.setRequestHeader("Accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) resolve(xhr.response as T);
      else reject(errorFrom(xhr.status, xhr.response));
    };
    xhr.onerror = () => reject(new ApiError(0, "The connection dropped during the upload. Try again."));
    xhr.onabort = () => reject(new ApiError(0, "Upload cancelled."));
    signal?.addEventListener("abort", () => xhr.abort());
    xhr.send(form);
  });
}

function errorFrom(status: number, parsed: unknown): ApiError {
  const body = parsed && typeof parsed === "object" ? (parsed as Record<string, unknown>) : {};
  const err = (body.error ?? {}) as { code?: string; message?: string; fieldErrors?: FieldErrors };
  return new ApiError(status, err.message ?? `The server answered ${status}.`, err.code ?? "", err.fieldErrors ?? {}, body);
}
