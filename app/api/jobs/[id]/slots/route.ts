import { route } from "@/lib/http/route";
import { listJobSlots } from "@/lib/visits/slots";
import { slotsQuerySchema, visitIdParams } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

/** GET /api/jobs/[id]/slots?from&to → { slots: [{ technicianId, start, end, … }] } with ISO instants. */
export const GET = route({ roles: ["admin", "staff", "technician", "owner"], params: visitIdParams, query: slotsQuerySchema }, ({ actor, params, query }) =>
  listJobSlots(actor, params.id, query),
);
