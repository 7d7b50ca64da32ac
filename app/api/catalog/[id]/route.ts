import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { archiveCatalogProduct, updateCatalogProduct } from "@/lib/catalog";
import { parseJson, route } from "@/lib/http/route";
import { catalogPatchSchema, idParam } from "@/lib/validation/pieces";

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const admin = await requireAdmin();
  const body = await parseJson(req, catalogPatchSchema);
  return NextResponse.json({ product: updateCatalogProduct(admin, id, body) });
});

/** Archives: layers that used the product keep their label. */
export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json({ product: archiveCatalogProduct(await requireAdmin(), id) });
});
