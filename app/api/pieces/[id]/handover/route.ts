import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { handoverStatus, sendHandover } from "@/lib/pieces/handover";
import { idParam } from "@/lib/validation/pieces";

export const dynamic = "force-dynamic";

/** Whether the piece's hand-over mail went out, its link was opened, the piece registered through it. */
export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(handoverStatus(await requireStaff(), id));
});

/** Sends the hand-over mail (again, with a fresh link; the last link stops working). */
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(await sendHandover(await requireStaff(), id));
});
