import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { createJobFromClaim } from "@/lib/claims/open-job";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

/** Staff open the repair job of an accepted claim: 201 with the job; 409 for a claim not accepted or one that has its job. */
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const staff = await requireStaff();
  return NextResponse.json({ job: createJobFromClaim(staff, id) }, { status: 201 });
});
