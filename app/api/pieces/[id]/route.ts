import { route } from "@/lib/http/route";
import { deletePiece, getPieceDetail, updatePiece } from "@/lib/pieces/registry";
import { idParam, piecePatchSchema } from "@/lib/validation/pieces";

export const GET = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => getPieceDetail(actor, params.id));

export const PATCH = route({ roles: ["admin", "staff"], params: idParam, body: piecePatchSchema }, ({ actor, params, body }) => ({ piece: updatePiece(actor, params.id, body) }));

export const DELETE = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => deletePiece(actor, params.id));
