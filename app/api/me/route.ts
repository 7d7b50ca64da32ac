import { NextResponse } from "next/server";
import { requireUser, studioMemberships } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";

export const GET = route(async () => {
  const user = await requireUser();
  const studios = (await studioMemberships(user.id)).map((m) => ({ id: m.studio.id, name: m.studio.name, role: m.role }));
  return NextResponse.json({ user: { id: user.id, email: user.email, name: user.name, emailVerified: Boolean(user.emailVerifiedAt) }, studios });
});
