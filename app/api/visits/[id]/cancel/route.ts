import { NextResponse } from "next/server";
import { parseJson, route } from "@/lib/http/route";
import { requireVisitActor } from "@/lib/visits/access";
import { cancelVisit } from "@/lib/visits/cancel";
import { cancelVisitSchema, visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/cancel { reason? } */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const actor = await requireVisitActor();
  const body = await parseJson(req, cancelVisitSchema.optional(), { optional: true });
  return NextResponse.json({ visit: await cancelVisit(actor, id, body) });
});
