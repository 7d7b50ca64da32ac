import { route } from "@/lib/http/route";
import { heldAskSchema, resolveHeldPayment } from "@/lib/plans/held";
import { idParam } from "@/lib/validation/pieces";

// Staff settle a renewal payment held because its amount wasn't the plan's: POST { invoiceId, resolution
// (accept | refund_difference | refund_and_end), version, amountMinor, refundMinor } — what they were shown
// (GET /api/plans/subscriptions/[id], "held"); 409 when any of it has changed. lib/plans/held.ts.
export const POST = route({ roles: ["admin", "staff"], params: idParam, body: heldAskSchema, bodyLimit: 1024 }, async ({ actor, params, body }) => ({ subscription: await resolveHeldPayment(actor, params.id, body) }));
