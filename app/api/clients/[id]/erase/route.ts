import { eraseClient } from "@/lib/clients/personal-data";
import { route } from "@/lib/http/route";
import { clientIdParam, eraseClientSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** Admins: erases a client on their request (personal fields, photos); their pieces stay for the warranty record. */
export const POST = route({ roles: ["admin"], params: clientIdParam, body: eraseClientSchema }, async ({ actor, params }) => ({ erased: await eraseClient(actor, params.id) }));
