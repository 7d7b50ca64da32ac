import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { removeLayer, updateLayer } from "@/lib/pieces/layers";
import { layerParams, layerPatchSchema } from "@/lib/validation/pieces";

export const PATCH = route<{ id: string; layerId: string }>(async (req, ctx) => {
  const { id, layerId } = layerParams.parse(ctx.params);
  const studio = await requireStaff();
  const body = await parseJson(req, layerPatchSchema);
  return NextResponse.json(updateLayer(studio, id, layerId, body));
});

export const DELETE = route<{ id: string; layerId: string }>(async (_req, ctx) => {
  const { id, layerId } = layerParams.parse(ctx.params);
  return NextResponse.json(removeLayer(await requireStaff(), id, layerId));
});
