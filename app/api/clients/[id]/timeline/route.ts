import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { clientTimeline } from "@/lib/clients/timeline";
import { parseQuery, route } from "@/lib/http/route";
import { clientIdParam, timelineQuerySchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** The newest ?limit= (50 unless asked; at most 1,000) entries of the client's timeline, and hasMore. */
export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = clientIdParam.parse(ctx.params);
  const { limit } = parseQuery(req, timelineQuerySchema);
  return NextResponse.json(clientTimeline(await requireStaff(), id, limit));
});
