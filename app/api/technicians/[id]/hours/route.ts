import { NextResponse } from "next/server";
import { requireStudioMember } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { getTechnicianHours, putTechnicianHours } from "@/lib/visits/technicians";
import { technicianHoursSchema, visitIdParams } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

/** GET /api/technicians/[id]/hours: staff, or the technician themself. */
export const GET = route<{ id: string }>(async (_req, { params }) => {
  const { id } = visitIdParams.parse(params);
  return NextResponse.json(getTechnicianHours(await requireStudioMember(), id));
});

/** PUT /api/technicians/[id]/hours { hours: [{ weekday, start, end }], timeOff: [{ date, start?, end?, note }] } (admin, staff). */
export const PUT = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const ctx = await requireStudioMember();
  const input = await parseJson(req, technicianHoursSchema);
  return NextResponse.json(putTechnicianHours(ctx, id, input));
});
