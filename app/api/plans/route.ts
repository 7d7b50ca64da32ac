import { z } from "zod";
import { isStaff } from "@/lib/auth/actor";
import { badRequest } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { plansForMyPiece } from "@/lib/plans/offers";
import { createTemplate, listTemplates } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";

const query = z.object({ pieceId: z.string().min(1).max(64).optional() });

// Staff: the studio's plan templates (current versions). An owner, with ?pieceId=: the plans that fit
// that piece of theirs (another owner's piece is a 404), or the plan it is under.
export const GET = route({ roles: ["admin", "staff", "owner"], query }, ({ actor, query }) => {
  if (isStaff(actor)) return { plans: listTemplates(actor.studio.id) };
  if (!query.pieceId) throw badRequest("Say which piece: ?pieceId=…", { pieceId: ["Required."] });
  return plansForMyPiece(actor.user, query.pieceId);
});

export const POST = route({ roles: ["admin"], body: planTemplateSchema, bodyLimit: 16_384, status: 201 }, ({ actor, body }) => ({ plan: createTemplate(actor, body) }));
