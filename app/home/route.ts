import { NextResponse } from "next/server";
import { getActor } from "@/lib/auth/actor";
import { homePathFor } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";

// Sends a signed-in person to their own start page, keeping notices (?denied=1, ?verified=1).
export const GET = route({}, async ({ req }) => {
  const actor = await getActor();
  const target = req.nextUrl.clone();
  target.pathname = actor ? await homePathFor(actor.user.id) : "/sign-in";
  return NextResponse.redirect(target, 303);
});
