import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { getOverview } from "@/lib/overview";

/** The overview's figures as JSON (the same object the /studio page renders). */
export const GET = route(async () => {
  const ctx = await requireStaff();
  return NextResponse.json(getOverview(ctx), { headers: { "Cache-Control": "private, no-store" } });
});
