import { clientIp } from "@/lib/auth/session";
import { route } from "@/lib/http/route";
import { registerPiece } from "@/lib/owner/registration";
import { registrationSchema } from "@/lib/validation/owner";

// POST { code } → 201 { pieceId }; 400 typo (field error), 403 e-mail not confirmed, 404 unknown, 409 already registered, 429.
// The code is checked (shape and check symbol) before any lookup or rate limit.
export const POST = route({ roles: ["owner"], body: registrationSchema, status: 201 }, async ({ req, actor, body }) =>
  registerPiece(actor.user, body, await clientIp(), new Date(), { acceptLanguage: req.headers.get("accept-language") }),
);
