import { NextResponse } from "next/server";
import { z } from "zod";
import { requireStaff } from "@/lib/auth/guards";
import { decideClaim } from "@/lib/claims/service";
import { parseJson, route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

/** `{ decision, coveredPct?, reason, expectedVersion? }`. Illegal from the claim's state → 409. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const staff = await requireStaff();
  const claim = await decideClaim(staff, id, await parseJson(req, z.unknown()));
  return NextResponse.json({ claim });
});
