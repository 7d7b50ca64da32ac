"use client";

import type { ActionResult } from "@/lib/validation/action";

type ErrorBody = { error?: { message?: string; fieldErrors?: Record<string, string[]> } };

/** Calls one of our JSON routes and answers like a server action, so useActionForm can show field errors. */
export async function callApi<T>(url: string, method: "POST" | "PATCH" | "DELETE", body?: unknown): Promise<ActionResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, {
      method,
      headers: body === undefined ? undefined : { "Content-Type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, message: "We couldn't reach the server. Check the connection and try again; nothing you typed is lost." };
  }
  const json = (await res.json().catch(() => ({}))) as T & ErrorBody;
  if (res.ok) return { ok: true, data: json };
  return { ok: false, message: json.error?.message ?? `The server answered ${res.status}.`, fieldErrors: json.error?.fieldErrors };
}

/** Empty input → null, else a number (NaN stays NaN so zod reports it). */
export const numberOrNull = (v: unknown) => (v === "" || v == null ? null : typeof v === "number" ? v : Number(String(v).replace(",", ".")));
export const emptyToNull = (v: unknown) => (v === "" || v == null ? null : v);
