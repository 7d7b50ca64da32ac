import { NextResponse, type NextRequest } from "next/server";
import { securityHeaders } from "@/lib/http/security-headers.mjs";

// Thin on purpose: a cookie-presence redirect for the signed-in areas and the current path for the
// sign-in return link. The real checks are in lib/auth, next to the queries. It also answers a path
// with broken %-encoding (which names no page or record) with a 404 before Next.js tries to decode it.
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

function malformed(req: NextRequest): NextResponse {
  if (req.nextUrl.pathname.startsWith("/api/")) {
    const res = NextResponse.json({ error: { code: "not_found", message: "Not found." } }, { status: 404 });
    for (const { key, value } of securityHeaders({ appUrl: process.env.APP_URL, dev: process.env.NODE_ENV !== "production" })) res.headers.set(key, value);
    res.headers.set("Cache-Control", "no-store");
    return res;
  }
  // A path no page has: Next.js renders app/not-found.tsx with a 404 and the usual headers.
  const url = req.nextUrl.clone();
  url.pathname = "/_malformed-path";
  url.search = "";
  return NextResponse.rewrite(url);
}

export function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
  if (!decodable(pathname)) return malformed(req);
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
