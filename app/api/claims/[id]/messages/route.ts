import { postClaimMessage } from "@/lib/claims/reply";
import { route } from "@/lib/http/route";
import { claimMessageSchema, idParam } from "@/lib/validation/claims";

/** `{ body, requestInfo? }`; requestInfo (staff) asks the owner for more and sets awaiting_owner. */
export const POST = route({ roles: ["admin", "staff", "owner"], params: idParam, body: claimMessageSchema, status: 201 }, ({ actor, params, body }) =>
  postClaimMessage(actor, params.id, body),
);
