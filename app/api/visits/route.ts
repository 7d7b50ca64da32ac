import { route } from "@/lib/http/route";
import { bookVisit } from "@/lib/visits/book";
import { withFreshSlots } from "@/lib/visits/http";
import { listVisits } from "@/lib/visits/list";
import { bookVisitSchema, listVisitsQuerySchema } from "@/lib/validation/visits";

export const dynamic = "force-dynamic";

const EVERYONE = ["admin", "staff", "technician", "owner"] as const;

/** GET /api/visits?technician&from&to */
export const GET = route({ roles: EVERYONE, query: listVisitsQuerySchema }, ({ actor, query }) => listVisits(actor, query));

/** POST /api/visits { jobId, technicianId, start, location? } → 201 with the visit, 409 with fresh slots. */
export const POST = route({ roles: EVERYONE, body: bookVisitSchema }, ({ actor, body }) => withFreshSlots(() => bookVisit(actor, body), 201));
