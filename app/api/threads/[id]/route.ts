import { route } from "@/lib/http/route";
import { getThread, updateThread } from "@/lib/messages/service";
import { threadIdParam, threadUpdateSchema } from "@/lib/validation/messages";

export const dynamic = "force-dynamic";

export const GET = route({ roles: ["admin", "staff"], params: threadIdParam }, ({ actor, params }) => getThread(actor, params.id));

/** `{ assignedToId?, state? }`: assign to a staff member (null: nobody), mark done or open again. */
export const PATCH = route({ roles: ["admin", "staff"], params: threadIdParam, body: threadUpdateSchema }, ({ actor, params, body }) => updateThread(actor, params.id, body));
