import { clientTimeline } from "@/lib/clients/timeline";
import { route } from "@/lib/http/route";
import { clientIdParam, timelineQuerySchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** The newest ?limit= (50 unless asked; at most 1,000) entries of the client's timeline, and hasMore. */
export const GET = route({ roles: ["admin", "staff"], params: clientIdParam, query: timelineQuerySchema }, ({ actor, params, query }) => clientTimeline(actor, params.id, query.limit));
