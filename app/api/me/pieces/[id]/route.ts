import { NextResponse } from "next/server";
import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { getMyPiece } from "@/lib/owner/pieces";

export const GET = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireUser();
  return NextResponse.json({ piece: getMyPiece(user, params.id) });
});
