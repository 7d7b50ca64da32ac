import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { env } from "@/lib/env";
import { AppError, badRequest, forbidden } from "@/lib/errors";
import { asAppError } from "@/lib/validation/care-input";

export type ErrorBody = { error: { code: string; message: string; fieldErrors?: Record<string, string[]> } };

export function errorResponse(e: AppError): NextResponse<ErrorBody> {
  const res = NextResponse.json(
    { error: { code: e.code, message: e.message, ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}) } },
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
  return async (req: NextRequest, ctx: { params: Promise<P> }): Promise<Response> => {
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
  };
}

/** Parses a JSON body with a zod schema; a body that is not JSON is a 400 too. */
export async function parseJson<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  let raw: unknown;
  try {
    raw = await req.json();
  } catch {
    throw badRequest("The request body must be JSON.");
  }
  return schema.parse(raw);
}

export function parseQuery<S extends z.ZodType>(req: NextRequest, schema: S): z.output<S> {
  return schema.parse(Object.fromEntries(req.nextUrl.searchParams));
}
