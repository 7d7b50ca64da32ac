import { NextResponse, type NextRequest } from "next/server";
import { badRequest, payloadTooLarge, type AppError } from "@/lib/errors";
import { ACTION_BODY_LIMIT_BYTES } from "@/lib/http/action-origins.mjs";
import { securityHeaders } from "@/lib/http/security-headers.mjs";

// Thin on purpose: a cookie-presence redirect for the signed-in areas and the current path for the
// sign-in return link. The real checks are in lib/auth, next to the queries. It also answers a path
// with broken %-encoding (which names no page or record) with a 404 before Next.js tries to decode it,
// and a server-action call that declares a body over the actions' limit with a 413, or whose arguments
// are not what React sends (a JSON array, alone or as the multipart reply's root field "0") with a
// 400: Next.js answers both with a 500.
const SIGNED_IN_AREAS = ["/studio", "/pieces", "/account"];

/** Whether every %-escape in the path decodes to UTF-8. */
function decodable(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return true;
  } catch {
    return false;
  }
}

/** The one error shape (lib/http/route.ts errorResponse), with the headers every answer carries. */
function refusal(status: number, error: { code: string; message: string }): NextResponse {
  const res = NextResponse.json({ error }, { status });
  for (const { key, value } of securityHeaders({ appUrl: process.env.APP_URL, dev: process.env.NODE_ENV !== "production" })) res.headers.set(key, value);
  res.headers.set("Cache-Control", "no-store");
  return res;
}

/**
 * What is wrong with a server-action call (a POST naming its action), if anything: a declared body
 * over the actions' limit, or arguments React's client never sends. Next.js has copied the body for
 * the proxy (next.config.mjs proxyClientMaxBodySize), so reading it here leaves it for the action.
 */
async function refusedAction(req: NextRequest): Promise<AppError | null> {
  if (req.method !== "POST" || !req.headers.has("next-action")) return null;
  const length = Number(req.headers.get("content-length"));
  if (Number.isFinite(length) && length > ACTION_BODY_LIMIT_BYTES) return payloadTooLarge(ACTION_BODY_LIMIT_BYTES);
  try {
    // Sent without a length (chunked), the body is measured here.
    const body = await req.arrayBuffer();
    if (body.byteLength > ACTION_BODY_LIMIT_BYTES) return payloadTooLarge(ACTION_BODY_LIMIT_BYTES);
    const type = req.headers.get("content-type") ?? "";
    const root: unknown = JSON.parse(type.startsWith("multipart/form-data") ? String((await new Response(body, { headers: { "content-type": type } }).formData()).get("0")) : new TextDecoder().decode(body));
    if (Array.isArray(root)) return null;
  } catch {
    // not JSON, or not a form: refused below
  }
  return badRequest("We could not read that request. Reload the page and try again.");
}

function malformed(req: NextRequest): NextResponse {
  if (req.nextUrl.pathname.startsWith("/api/")) return refusal(404, { code: "not_found", message: "Not found." });
  // A path no page has: Next.js renders app/not-found.tsx with a 404 and the usual headers.
  const url = req.nextUrl.clone();
  url.pathname = "/_malformed-path";
  url.search = "";
  return NextResponse.rewrite(url);
}

export async function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  if (!decodable(pathname)) return malformed(req);
  const refused = await refusedAction(req);
  if (refused) return refusal(refused.status, { code: refused.code, message: refused.message });
  if (pathname.startsWith("/api/")) return NextResponse.next();
  const needsSession = SIGNED_IN_AREAS.some((p) => pathname === p || pathname.startsWith(`${p}/`));
  if (needsSession && !req.cookies.has("gw_session")) {
    const url = req.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = `?next=${encodeURIComponent(pathname + search)}`;
    return NextResponse.redirect(url);
  }
  const headers = new Headers(req.headers);
  headers.set("x-grainward-path", pathname + search);
  return NextResponse.next({ request: { headers } });
}

export const config = {
  // Pages, and API paths only when they hold a %-escape (no id does), so API bodies such as photo
  // uploads are not copied for the proxy.
  matcher: ["/((?!_next/|api/|favicon.ico|fonts/).*)", "/api/(.*%.*)"],
};
