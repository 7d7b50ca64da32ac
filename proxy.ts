import { NextResponse, type NextRequest } from "next/server";

// Thin on purpose: a cookie-presence redirect for the signed-in areas and the current path for the
// sign-in return link. The real checks are in lib/auth, next to the queries.
const SIGNED_IN_AREAS = ["/studio", "/pieces", "/account"];

export function proxy(req: NextRequest) {
  const { pathname, search } = req.nextUrl;
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
  matcher: ["/((?!_next/|api/|favicon.ico|fonts/).*)"],
};
