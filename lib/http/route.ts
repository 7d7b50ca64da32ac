import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { env } from "@/lib/env";
import { AppError, badRequest, forbidden } from "@/lib/errors";
import { asAppError } from "@/lib/validation/care-input";
import { readJson } from "./body";

export type ErrorBody = { error: { code: string; message: string; fieldErrors?: Record<string, string[]> } };

export function errorResponse(e: AppError): NextResponse<ErrorBody> {
  const res = NextResponse.json(
    { ...e.extra, error: { code: e.code, message: e.message, ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}) } },
    { status: e.status },
  );
  if (e.retryAfterSec) res.headers.set("Retry-After", String(Math.ceil(e.retryAfterSec)));
  return res;
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** State-changing requests must come from our own pages (or from a client that sends no Origin). */
function checkOrigin(req: NextRequest): void {
  if (SAFE_METHODS.has(req.method)) return;
  const origin = req.headers.get("origin");
  if (!origin) return;
  const allowed = new Set([new URL(env.APP_URL).origin, req.nextUrl.origin]);
  if (!allowed.has(origin)) throw forbidden("Requests from another site are refused.");
}

type Handler<P> = (req: NextRequest, ctx: { params: P }) => Promise<Response>;

/**
 * Wraps a route handler: refuses cross-site writes, and answers AppErrors and zod errors with a JSON
 * error and their 4xx status. Anything else is a bug: logged, and a plain 500 without details.
 */
export function route<P = Record<string, never>>(handler: Handler<P>) {
  return async (req: NextRequest, ctx: { params: Promise<P> }): Promise<Response> => privateJson(await answer(req, ctx, handler));
}

async function answer<P>(req: NextRequest, ctx: { params: Promise<P> }, handler: Handler<P>): Promise<Response> {
  try {
    checkOrigin(req);
    return await handler(req, { params: await ctx.params });
  } catch (e) {
    const known = asAppError(e);
    if (known) return errorResponse(known);
    if (e instanceof z.ZodError) {
      const flat = z.flattenError(e);
      return errorResponse(badRequest(flat.formErrors[0] ?? "Some fields need a second look.", flat.fieldErrors as Record<string, string[]>));
    }
    console.error(e);
    return NextResponse.json({ error: { code: "internal", message: "Something went wrong on our side." } }, { status: 500 });
  }
}

/**
 * JSON answers depend on who is signed in: no shared cache may keep one (`private`), no cache may
 * store one at all (`no-store`: they carry names, addresses and money), and anything that does keep
 * a copy must key it by the session cookie (`Vary: Cookie`).
 */
function privateJson(res: Response): Response {
  if (!res.headers.get("content-type")?.startsWith("application/json")) return res;
  res.headers.set("Cache-Control", "private, no-store");
  const vary = res.headers.get("Vary");
  if (!vary || !/(^|,)\s*cookie\s*(,|$)/i.test(vary)) res.headers.set("Vary", vary ? `${vary}, Cookie` : "Cookie");
  return res;
}

/**
 * Parses a JSON body with a zod schema. The body is read through lib/http/body.ts: at most `limit`
 * bytes (1 MB unless the route says), else a 413; not JSON is a 400; `optional`: empty is undefined.
 */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S, opts?: { limit?: number; optional?: boolean }): Promise<z.output<S>> {
  return schema.parse(await readJson(req, opts));
}

export function parseQuery<S extends z.ZodType>(req: NextRequest, schema: S): z.output<S> {
  return schema.parse(Object.fromEntries(req.nextUrl.searchParams));
}
