import type { ActionResult } from "@/lib/validation/action";

/** Calls one of our JSON routes and answers like a server action, so useActionForm can drive it. */
export async function callApi<T>(url: string, init: RequestInit): Promise<ActionResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, { ...init, headers: { Accept: "application/json", ...(init.headers ?? {}) } });
  } catch {
    return { ok: false, message: "We couldn't reach Grainward. Check your connection and try again — what you typed is still here." };
  }
  const body = (await res.json().catch(() => null)) as (T & { error?: { message: string; fieldErrors?: Record<string, string[]> } }) | null;
  if (res.ok) return { ok: true, data: body as T };
  return {
    ok: false,
    message: body?.error?.message ?? "Something went wrong on our side. Please try again in a moment.",
    fieldErrors: body?.error?.fieldErrors,
  };
}
