import { createCatalogProduct, listCatalog } from "@/lib/catalog";
import { route } from "@/lib/http/route";
import { catalogProductSchema } from "@/lib/validation/pieces";

/** Staff read the catalog (layer pickers); admins change it (lib/catalog says so too). */
export const GET = route({ roles: ["admin", "staff"] }, ({ actor }) => ({ products: listCatalog(actor) }));

export const POST = route({ roles: ["admin"], body: catalogProductSchema, status: 201 }, ({ actor, body }) => ({ product: createCatalogProduct(actor, body) }));
