import { route } from "@/lib/http/route";
import { removeLayer, updateLayer } from "@/lib/pieces/layers";
import { layerParams, layerPatchSchema } from "@/lib/validation/pieces";

export const PATCH = route({ roles: ["admin", "staff"], params: layerParams, body: layerPatchSchema }, ({ actor, params, body }) => updateLayer(actor, params.id, params.layerId, body));

export const DELETE = route({ roles: ["admin", "staff"], params: layerParams }, ({ actor, params }) => removeLayer(actor, params.id, params.layerId));
