import { route } from "@/lib/http/route";
import { withFreshSlots } from "@/lib/visits/http";
import { moveVisit } from "@/lib/visits/reschedule";
import { moveVisitSchema, visitIdParams } from "@/lib/validation/visits";

/** PATCH /api/visits/[id] { start, technicianId?, location? }: moves the visit (same checks as booking). */
export const PATCH = route({ roles: ["admin", "staff", "technician", "owner"], params: visitIdParams, body: moveVisitSchema }, ({ actor, params, body }) =>
  withFreshSlots(() => moveVisit(actor, params.id, body)),
);
