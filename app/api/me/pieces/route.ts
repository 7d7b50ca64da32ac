import { NextResponse } from "next/server";
import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { listMyPieces } from "@/lib/owner/pieces";

export const GET = route(async () => {
  const user = await requireUser();
  return NextResponse.json({ pieces: listMyPieces(user) });
});
