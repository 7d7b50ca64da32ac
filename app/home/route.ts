import { NextResponse, type NextRequest } from "next/server";
import { homePathFor } from "@/lib/auth/guards";
import { getCurrentSession } from "@/lib/auth/session";

// Sends a signed-in person to their own start page, keeping notices (?denied=1, ?verified=1).
export async function GET(req: NextRequest) {
  const { user } = await getCurrentSession();
  const target = req.nextUrl.clone();
  target.pathname = user ? await homePathFor(user.id) : "/sign-in";
  return NextResponse.redirect(target, 303);
}
