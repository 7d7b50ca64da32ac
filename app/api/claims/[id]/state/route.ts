import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { transitionClaim } from "@/lib/claims/transition";
import { parseJson, route } from "@/lib/http/route";
import { claimStateSchema, idParam } from "@/lib/validation/claims";

/** `{ to, expectedVersion? }`: start review, resume review, repair booked, closed. Illegal → 409. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const staff = await requireStaff();
  const input = await parseJson(req, claimStateSchema);
  return NextResponse.json({ claim: transitionClaim(staff, id, input) });
});
