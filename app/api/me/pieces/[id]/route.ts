import { route } from "@/lib/http/route";
import { getMyPiece } from "@/lib/owner/pieces";
import { piecePlan } from "@/lib/plans/offers";
import { idParam } from "@/lib/validation/pieces";

export const GET = route({ roles: ["owner"], params: idParam }, ({ actor, params }) => {
  const piece = getMyPiece(actor.user, params.id);
  return { piece, plan: piecePlan(piece.id) };
});
