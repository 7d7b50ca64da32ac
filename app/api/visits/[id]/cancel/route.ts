import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { requireVisitActor } from "@/lib/visits/access";
import { cancelVisit } from "@/lib/visits/service";
import { visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/cancel { reason? } */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const actor = await requireVisitActor();
  const text = await req.text();
  let body: unknown = {};
  if (text.trim()) {
    try {
      body = JSON.parse(text);
    } catch {
      return NextResponse.json({ error: { code: "bad_request", message: "The request body must be JSON." } }, { status: 400 });
    }
  }
  return NextResponse.json({ visit: await cancelVisit(actor, id, body) });
});
