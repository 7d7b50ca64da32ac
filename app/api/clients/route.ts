import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { route } from "@/lib/http/route";
import { clientListQuerySchema, createClientSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** The studio's clients: ?q= (name, e-mail, phone digits, piece title), filter=, sort=, dir=, page= (50 a page). */
export const GET = route({ roles: ["admin", "staff"], query: clientListQuerySchema }, ({ actor, query }) => listClients(actor, query));

export const POST = route({ roles: ["admin", "staff"], body: createClientSchema, status: 201 }, ({ actor, body }) => ({ client: createClient(actor, body) }));
