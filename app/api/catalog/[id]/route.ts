import { archiveCatalogProduct, updateCatalogProduct } from "@/lib/catalog";
import { route } from "@/lib/http/route";
import { catalogPatchSchema, idParam } from "@/lib/validation/pieces";

export const PATCH = route({ roles: ["admin"], params: idParam, body: catalogPatchSchema }, ({ actor, params, body }) => ({
  product: updateCatalogProduct(actor, params.id, body),
}));

/** Archives: layers that used the product keep their label. */
export const DELETE = route({ roles: ["admin"], params: idParam }, ({ actor, params }) => ({ product: archiveCatalogProduct(actor, params.id) }));
