import { NextResponse } from "next/server";
import { requireStudioMember } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { submitReport } from "@/lib/visits/report";
import { visitIdParams, visitReportSchema } from "@/lib/validation/visits";

/** POST /api/visits/[id]/report: the visit's technician (or staff) files what was done. */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const ctx = await requireStudioMember();
  const input = await parseJson(req, visitReportSchema);
  const r = await submitReport(ctx, id, input);
  return NextResponse.json({ visit: r.visit, layers: r.layers.map((l) => l.id), nextCare: r.schedule.tasks.map((t) => ({ kind: t.kind, surface: t.surface, dueOn: t.dueOn })) });
});
