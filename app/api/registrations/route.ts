import { NextResponse } from "next/server";
import { z } from "zod";
import { requireUser } from "@/lib/auth/guards";
import { clientIp } from "@/lib/auth/session";
import { parseJson, route } from "@/lib/http/route";
import { registerPiece } from "@/lib/owner/registration";

// POST { code } → 201 { pieceId }; 400 typo (field error), 403 e-mail not confirmed, 404 unknown, 409 already registered, 429.
export const POST = route(async (req) => {
  const user = await requireUser();
  const body = await parseJson(req, z.unknown());
  const result = await registerPiece(user, body, await clientIp(), new Date(), { acceptLanguage: req.headers.get("accept-language") });
  return NextResponse.json(result, { status: 201 });
});
