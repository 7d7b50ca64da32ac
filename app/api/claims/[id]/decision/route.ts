import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { decideClaim } from "@/lib/claims/decide-claim";
import { parseJson, route } from "@/lib/http/route";
import { claimDecisionSchema, idParam } from "@/lib/validation/claims";

/** `{ decision, coveredPct?, reason, expectedVersion? }`. Illegal from the claim's state → 409. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const staff = await requireStaff();
  const claim = await decideClaim(staff, id, await parseJson(req, claimDecisionSchema));
  return NextResponse.json({ claim });
});
