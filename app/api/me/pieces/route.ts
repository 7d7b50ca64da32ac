import { route } from "@/lib/http/route";
import { listMyPieces } from "@/lib/owner/pieces";

export const GET = route({ roles: ["owner"] }, ({ actor }) => ({ pieces: listMyPieces(actor.user) }));
