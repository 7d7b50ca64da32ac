import { route } from "@/lib/http/route";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { listPieces } from "@/lib/pieces/registry";
import { deliverPieceSchema } from "@/lib/validation/clients";

/** The registry's page for the query string (parsed by lib/pieces/registry-list.ts). */
export const GET = route({ roles: ["admin", "staff"] }, ({ req, actor }) => listPieces(actor, Object.fromEntries(req.nextUrl.searchParams)));

export const POST = route({ roles: ["admin", "staff"], body: deliverPieceSchema, status: 201 }, ({ actor, body }) => deliverPiece(actor, body));
