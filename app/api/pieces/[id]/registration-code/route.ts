import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { reissueRegistrationCode } from "@/lib/pieces/registry";
import { idParam } from "@/lib/validation/pieces";

/** Reissues the piece's registration code; the old code stops working at once. */
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(reissueRegistrationCode(await requireStaff(), id), { headers: { "Cache-Control": "no-store" } });
});
