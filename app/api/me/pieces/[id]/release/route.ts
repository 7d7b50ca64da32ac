import { NextResponse } from "next/server";
import { z } from "zod";
import { requireUser } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { releasePiece } from "@/lib/owner/transfer";

// POST { confirm: true } → 200 { pieceId, code } — the fresh code is in this answer once, and in the owner's e-mail.
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireUser();
  const body = await parseJson(req, z.unknown());
  const result = await releasePiece(user, params.id, body);
  return NextResponse.json(result, { headers: { "Cache-Control": "no-store" } });
});
