import { NextResponse } from "next/server";
import { parseQuery, route } from "@/lib/http/route";
import { requireVisitActor } from "@/lib/visits/access";
import { listJobSlots } from "@/lib/visits/slots";
import { slotsQuerySchema, visitIdParams } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

/** GET /api/jobs/[id]/slots?from&to → { slots: [{ technicianId, start, end, … }] } with ISO instants. */
export const GET = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const q = parseQuery(req, slotsQuerySchema);
  return NextResponse.json(listJobSlots(await requireVisitActor(), id, q));
});
