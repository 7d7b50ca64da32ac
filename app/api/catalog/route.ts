import { NextResponse } from "next/server";
import { requireAdmin, requireStaff } from "@/lib/auth/guards";
import { createCatalogProduct, listCatalog } from "@/lib/catalog";
import { parseJson, route } from "@/lib/http/route";
import { catalogProductSchema } from "@/lib/validation/pieces";

/** Staff read the catalog (layer pickers); admins change it. */
export const GET = route(async () => NextResponse.json({ products: listCatalog(await requireStaff()) }));

export const POST = route(async (req) => {
  const ctx = await requireAdmin();
  const body = await parseJson(req, catalogProductSchema);
  return NextResponse.json({ product: createCatalogProduct(ctx, body) }, { status: 201 });
});
