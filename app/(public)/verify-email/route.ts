import { NextResponse, type NextRequest } from "next/server";
import { verifyEmail } from "@/lib/auth/accounts";
import { safeNextPath } from "@/lib/validation/auth";

// The link in the verification e-mail. A used or expired link goes to a page that offers a new one.
export async function GET(req: NextRequest) {
  const token = req.nextUrl.searchParams.get("token") ?? "";
  const next = safeNextPath(req.nextUrl.searchParams.get("next"));
  const userId = token.length >= 10 && token.length <= 200 ? verifyEmail(token) : null;
  const target = req.nextUrl.clone();
  target.search = "";
  if (!userId) {
    target.pathname = "/verify-email/sent";
    target.searchParams.set("failed", "1");
  } else {
    target.pathname = next ?? "/home";
    if (!next) target.searchParams.set("verified", "1");
  }
  return NextResponse.redirect(target, 303);
}
