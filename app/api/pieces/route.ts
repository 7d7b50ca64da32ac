import { route } from "@/lib/http/route";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { listPieces } from "@/lib/pieces/registry";
import { deliverPieceSchema } from "@/lib/validation/clients";
import { pieceListQuerySchema } from "@/lib/validation/pieces";

/** The registry's page for the query string: search, filters, sorting and pagination. */
export const GET = route({ roles: ["admin", "staff"], query: pieceListQuerySchema }, ({ actor, query }) => listPieces(actor, query));

export const POST = route({ roles: ["admin", "staff"], body: deliverPieceSchema, status: 201 }, ({ actor, body }) => deliverPiece(actor, body));
