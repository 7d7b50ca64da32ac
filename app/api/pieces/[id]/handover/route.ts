import { route } from "@/lib/http/route";
import { handoverStatus, sendHandover } from "@/lib/pieces/handover";
import { idParam } from "@/lib/validation/pieces";

export const dynamic = "force-dynamic";

/** Whether the piece's hand-over mail went out, its link was opened, the piece registered through it. */
export const GET = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => handoverStatus(actor, params.id));

/** Sends the hand-over mail (again, with a fresh link; the last link stops working). */
export const POST = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => sendHandover(actor, params.id));
