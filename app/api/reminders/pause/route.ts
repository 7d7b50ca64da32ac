import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { setPiecePaused } from "@/lib/reminders/staff";
import { pauseSchema } from "@/lib/validation/reminders";

/** POST { pieceId, paused } — pause or resume a piece's care reminders. */
export const POST = route(async (req) => {
  const body = await parseJson(req, pauseSchema);
  return NextResponse.json(setPiecePaused(await requireStaff(), body));
});
