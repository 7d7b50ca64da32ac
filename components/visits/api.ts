"use client";

export type SlotView = { technicianId: string; technicianName: string; start: string; end: string; localDate: string; localStart: string; localEnd: string };
export type ApiError = { status: number; message: string; fieldErrors?: Record<string, string[]>; slots?: SlotView[] };

/** Calls one of the visit routes; throws an ApiError (with fresh slots on a 409) when it is refused. */
export async function visitApi<T>(url: string, method: "GET" | "POST" | "PATCH" | "PUT", body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { method, headers: body === undefined ? undefined : { "Content-Type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  } catch {
    throw { status: 0, message: "We couldn't reach the server. Check the connection and try again." } satisfies ApiError;
  }
  const json = await res.json().catch(() => ({}));
  if (!res.ok) throw { status: res.status, message: json.error?.message ?? `The server answered ${res.status}.`, fieldErrors: json.error?.fieldErrors, slots: json.slots } satisfies ApiError;
  return json as T;
}

export const isApiError = (e: unknown): e is ApiError => typeof e === "object" && e !== null && "status" in e && "message" in e;
