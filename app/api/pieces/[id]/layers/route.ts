import { route } from "@/lib/http/route";
import { addLayer } from "@/lib/pieces/layers";
import { idParam, layerSchema } from "@/lib/validation/pieces";

export const POST = route({ roles: ["admin", "staff"], params: idParam, body: layerSchema, status: 201 }, ({ actor, params, body }) => addLayer(actor, params.id, body));
