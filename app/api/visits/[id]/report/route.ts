import { route } from "@/lib/http/route";
import { submitReport } from "@/lib/visits/report";
import { visitIdParams, visitReportSchema } from "@/lib/validation/visits";

/** POST /api/visits/[id]/report: the visit's technician (or staff) files what was done. */
export const POST = route({ roles: ["admin", "staff", "technician"], params: visitIdParams, body: visitReportSchema }, async ({ actor, params, body }) => {
  const r = await submitReport(actor, params.id, body);
  return { visit: r.visit, layers: r.layers.map((l) => l.id), nextCare: r.schedule.tasks.map((t) => ({ kind: t.kind, surface: t.surface, dueOn: t.dueOn })) };
});
