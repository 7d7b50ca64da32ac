import { NextResponse } from "next/server";
import { parseJson, parseQuery, route } from "@/lib/http/route";
import { requireVisitActor } from "@/lib/visits/access";
import { withFreshSlots } from "@/lib/visits/http";
import { bookVisit } from "@/lib/visits/book";
import { listVisits } from "@/lib/visits/list";
import { bookVisitSchema, listVisitsQuerySchema } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

/** GET /api/visits?technician&from&to */
export const GET = route(async (req) => {
  const q = parseQuery(req, listVisitsQuerySchema);
  return NextResponse.json(listVisits(await requireVisitActor(), q));
});

/** POST /api/visits { jobId, technicianId, start, location? } → 201 with the visit, 409 with fresh slots. */
export const POST = route(async (req) => {
  const actor = await requireVisitActor();
  const input = await parseJson(req, bookVisitSchema);
  return withFreshSlots(() => bookVisit(actor, input), 201);
});
