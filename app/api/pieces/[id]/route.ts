import { NextResponse } from "next/server";
import { z } from "zod";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { getStudioPiece } from "@/lib/pieces/queries";

const params = z.object({ id: z.string().min(1).max(64) });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = params.parse(ctx.params);
  const piece = getStudioPiece(await requireStaff(), id);
  return NextResponse.json({ piece });
});
