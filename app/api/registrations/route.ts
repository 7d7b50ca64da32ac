import { z } from "zod";
import { clientIp } from "@/lib/auth/session";
import { route } from "@/lib/http/route";
import { registerPiece } from "@/lib/owner/registration";

// POST { code } → 201 { pieceId }; 400 typo (field error), 403 e-mail not confirmed, 404 unknown, 409 already registered, 429.
// lib/owner/registration.ts parses the code (registrationSchema) after its rate limit.
export const POST = route({ roles: ["owner"], body: z.unknown(), status: 201 }, async ({ req, actor, body }) =>
  registerPiece(actor.user, body, await clientIp(), new Date(), { acceptLanguage: req.headers.get("accept-language") }),
);
