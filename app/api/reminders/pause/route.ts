import { route } from "@/lib/http/route";
import { setPiecePaused } from "@/lib/reminders/staff";
import { pauseSchema } from "@/lib/validation/reminders";

/** POST { pieceId, paused } — pause or resume a piece's care reminders. */
export const POST = route({ roles: ["admin", "staff"], body: pauseSchema }, ({ actor, body }) => setPiecePaused(actor, body));
