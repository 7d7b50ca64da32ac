import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { requireActor, type ActorFor, type ActorRole } from "@/lib/auth/actor";
import { AppError, badRequest } from "@/lib/errors";
import { asAppError } from "@/lib/validation/care-input";
import { inWords } from "@/lib/validation/words";
import { BODY_LIMITS, readForm, readJson } from "./body";
import { checkOrigin } from "./origin";

// The one request boundary of the JSON API. A route names who may call it and what its input is, as
// data; the wrapper refuses other sites' writes, resolves the actor (lib/auth/actor.ts), parses the
// params, query and body once with their zod schemas, and answers every refusal in one JSON shape:
//
//   export const PATCH = route({ roles: ["admin"], params: idParams, body: productPatch }, ({ actor, params, body }) =>
//     ({ product: updateCatalogProduct(actor, params.id, body) }));
//
// A handler returns a Response, or a value answered as JSON (with `status`, 200 unless given).
//
// Where the object a write is about must be found before its body is judged (someone else's object is a
// 404 whatever they sent, the owner's with a bad body a 400), `load` finds it from the actor, params and
// query, between those and the body; the handler gets what it returned as `loaded`:
//
//   export const POST = route({ roles: ["staff"], params: idParams, load: ({ actor, params }) => loadThread(actor, params.id), body: messageForm },
//     ({ actor, loaded, body }) => reply(actor, loaded, body));

export type ErrorBody = { error: { code: string; message: string; fieldErrors?: Record<string, string[]> } };

export function errorResponse(e: AppError): NextResponse<ErrorBody> {
  const res = NextResponse.json(
    { ...e.extra, error: { code: e.code, message: e.message, ...(e.fieldErrors ? { fieldErrors: e.fieldErrors } : {}) } },
    { status: e.status },
  );
  if (e.retryAfterSec) res.headers.set("Retry-After", String(Math.ceil(e.retryAfterSec)));
  return res;
}

type AnySchema = z.ZodType;
type Out<S> = S extends AnySchema ? z.output<S> : undefined;

export type RouteSpec<R extends ActorRole, P, Q, B, L = undefined> = {
  /** Who may call: studio roles and/or "owner" (every signed-in person, on their own things). Omitted: anyone, no actor. */
  roles?: readonly R[];
  params?: P;
  query?: Q;
  /** The body's schema; read through lib/http/body.ts (at most `bodyLimit`: 1 MB of JSON, 64 KB of form unless given). */
  body?: B;
  /** "form": the body is a form (urlencoded or multipart, its text fields) instead of JSON. */
  bodyKind?: "json" | "form";
  bodyLimit?: number;
  /** An empty body reaches the schema as `undefined` instead of being a 400. */
  optionalBody?: boolean;
  /** The status of a value answered as JSON. */
  status?: number;
  /**
   * Writes from any site are accepted: only for a route whose authority is a signed token in the
   * request itself (RFC 8058 one-click unsubscribe, where the mail provider posts). Everything else
   * refuses other sites' writes (lib/http/origin.ts).
   */
  anyOrigin?: boolean;
  /** Finds what the request is about after the actor, params and query and before the body (see above). */
  load?: (input: Omit<RouteInput<R, P, Q, B>, "body" | "loaded">) => L | Promise<L>;
};

export type RouteInput<R extends ActorRole, P, Q, B, L = undefined> = {
  req: NextRequest;
  actor: [R] extends [never] ? null : ActorFor<R>;
  params: Out<P>;
  query: Out<Q>;
  body: Out<B>;
  loaded: L;
};

type NextContext = { params: Promise<unknown> };

export function route<R extends ActorRole = never, P extends AnySchema | undefined = undefined, Q extends AnySchema | undefined = undefined, B extends AnySchema | undefined = undefined, L = undefined>(
  spec: RouteSpec<R, P, Q, B, L>,
  handler: (input: RouteInput<R, P, Q, B, L>) => Promise<unknown> | unknown,
): (req: NextRequest, ctx: NextContext) => Promise<Response>;
export function route(spec: AnySpec, handler: (input: RouteInput<ActorRole, AnySchema | undefined, AnySchema | undefined, AnySchema | undefined, unknown>) => unknown) {
  return async (req: NextRequest, ctx: NextContext): Promise<Response> => {
    try {
      if (!spec.anyOrigin) checkOrigin(req, req.nextUrl.origin);
      return privateJson(answerValue(await handler(await parseInput(spec, req, await ctx.params)), spec.status));
    } catch (e) {
      return privateJson(errorAnswer(e));
    }
  };
}

type AnySpec = RouteSpec<ActorRole, AnySchema | undefined, AnySchema | undefined, AnySchema | undefined, unknown>;

/** Actor first (401/403 before anything about the input), then params and query, the loaded object, and the body, each once. */
async function parseInput(spec: AnySpec, req: NextRequest, rawParams: unknown) {
  const actor = spec.roles ? await requireActor(spec.roles) : null;
  const params = spec.params ? spec.params.parse(rawParams, { error: inWords }) : undefined;
  const query = spec.query ? spec.query.parse(Object.fromEntries(req.nextUrl.searchParams), { error: inWords }) : undefined;
  const found = { req, actor, params, query } as Omit<RouteInput<ActorRole, AnySchema, AnySchema, AnySchema, unknown>, "body" | "loaded">;
  const loaded = spec.load ? await spec.load(found) : undefined;
  const body = spec.body ? spec.body.parse(await readBodyOf(spec, req), { error: inWords }) : undefined;
  return { ...found, loaded, body } as RouteInput<ActorRole, AnySchema, AnySchema, AnySchema, unknown>;
}

function readBodyOf(spec: AnySpec, req: NextRequest): Promise<unknown> {
  if (spec.bodyKind !== "form") return readJson(req, { limit: spec.bodyLimit ?? BODY_LIMITS.json, optional: spec.optionalBody });
  return readForm(req, spec.bodyLimit ?? BODY_LIMITS.form, ["urlencoded", "multipart"]).then((form) =>
    Object.fromEntries([...form.entries()].map(([k, v]) => [k, typeof v === "string" ? v : ""])),
  );
}

function answerValue(value: unknown, status = 200): Response {
  return value instanceof Response ? value : NextResponse.json(value ?? null, { status });
}

/** AppErrors and zod errors → their 4xx in the one JSON shape; anything else is a bug: logged, a plain 500. */
export function errorAnswer(e: unknown): Response {
  const known = asAppError(e);
  if (known) return errorResponse(known);
  if (e instanceof z.ZodError) return errorResponse(zodError(e));
  console.error(e);
  return NextResponse.json({ error: { code: "internal", message: "Something went wrong on our side." } }, { status: 500 });
}

/** Every field's message, and the first form-level one (or a general one) as the message. */
export function zodError(e: z.ZodError): AppError {
  const flat = z.flattenError(e);
  return badRequest(flat.formErrors[0] ?? "Some fields need a second look.", flat.fieldErrors as Record<string, string[]>);
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
