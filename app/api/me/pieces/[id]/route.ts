import { route } from "@/lib/http/route";
import { getMyPiece } from "@/lib/owner/pieces";
import { idParam } from "@/lib/validation/pieces";

export const GET = route({ roles: ["owner"], params: idParam }, ({ actor, params }) => ({ piece: getMyPiece(actor.user, params.id) }));
