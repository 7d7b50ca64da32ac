import { route } from "@/lib/http/route";
import { cancelVisit } from "@/lib/visits/cancel";
import { cancelVisitSchema, visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/cancel { reason? } (an empty body too). */
export const POST = route({ roles: ["admin", "staff", "technician", "owner"], params: visitIdParams, body: cancelVisitSchema.optional(), optionalBody: true }, async ({ actor, params, body }) => ({
  visit: await cancelVisit(actor, params.id, body),
}));
