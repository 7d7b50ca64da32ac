import { z } from "zod";
import { route } from "@/lib/http/route";
import { listInbox, postOwnerMessage } from "@/lib/messages/service";
import { inboxQuerySchema } from "@/lib/validation/messages";

export const dynamic = "force-dynamic";

/** The studio's inbox: `?view=waiting|mine|all|done|unmatched` (staff). */
export const GET = route({ roles: ["admin", "staff"], query: inboxQuerySchema }, ({ actor, query }) => listInbox(actor, query));

/** An owner writes about a claim, repair job or visit of theirs: `{ about, id, body }` (parsed by lib/messages). */
export const POST = route({ roles: ["owner"], body: z.unknown(), bodyLimit: 64 * 1024, status: 201 }, ({ actor, body }) => postOwnerMessage(actor.user, body));
