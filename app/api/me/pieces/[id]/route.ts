import { NextResponse } from "next/server";
import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { getMyPiece } from "@/lib/owner/pieces";
import { piecePlan } from "@/lib/plans/offers";

export const GET = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireUser();
  const piece = getMyPiece(user, params.id);
  return NextResponse.json({ piece, plan: piecePlan(piece.id) });
});
