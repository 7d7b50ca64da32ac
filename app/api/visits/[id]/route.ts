import { parseJson, route } from "@/lib/http/route";
import { requireVisitActor } from "@/lib/visits/access";
import { withFreshSlots } from "@/lib/visits/http";
import { moveVisit } from "@/lib/visits/reschedule";
import { moveVisitSchema, visitIdParams } from "@/lib/validation/visits";

/** PATCH /api/visits/[id] { start, technicianId?, location? }: moves the visit (same checks as booking). */
export const PATCH = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const actor = await requireVisitActor();
  const input = await parseJson(req, moveVisitSchema);
  return withFreshSlots(() => moveVisit(actor, id, input));
});
