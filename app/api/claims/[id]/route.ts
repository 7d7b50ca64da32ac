import { NextResponse } from "next/server";
import { getClaim } from "@/lib/claims/view-claim";
import { currentViewer } from "@/lib/claims/viewer";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(getClaim(await currentViewer(), id));
});
