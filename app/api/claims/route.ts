import { createClaim } from "@/lib/claims/file-claim";
import { listOwnerClaims, listStudioClaims } from "@/lib/claims/list";
import { route } from "@/lib/http/route";
import { claimListQuerySchema, createClaimSchema } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

/** Staff: the studio's queue with filters (state, category, age, pieceId, sort). Owners: their own claims. */
export const GET = route({ roles: ["admin", "staff", "owner"], query: claimListQuerySchema }, ({ actor, query }) =>
  actor.role === "owner" ? { claims: listOwnerClaims(actor.user) } : listStudioClaims(actor, query),
);

export const POST = route({ roles: ["admin", "staff", "owner"], body: createClaimSchema, status: 201 }, async ({ actor, body }) => ({ claim: await createClaim(actor, body) }));
