import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { releasePiece } from "@/lib/owner/transfer";
import { releaseSchema } from "@/lib/validation/owner";
import { idParam } from "@/lib/validation/pieces";

// POST { confirm: true } → 200 { pieceId, code } — the fresh code is in this answer once, and in the owner's e-mail.
export const POST = route({ roles: ["owner"], params: idParam, body: releaseSchema }, async ({ actor, params, body }) =>
  NextResponse.json(await releasePiece(actor.user, params.id, body), { headers: { "Cache-Control": "no-store" } }),
);
