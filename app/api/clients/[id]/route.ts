import { getClient } from "@/lib/clients/get";
import { updateClient } from "@/lib/clients/update";
import { route } from "@/lib/http/route";
import { clientIdParam, clientPatchSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

export const GET = route({ roles: ["admin", "staff"], params: clientIdParam }, ({ actor, params }) => getClient(actor, params.id));

export const PATCH = route({ roles: ["admin", "staff"], params: clientIdParam, body: clientPatchSchema }, ({ actor, params, body }) => {
  updateClient(actor, params.id, body);
  return getClient(actor, params.id);
});
