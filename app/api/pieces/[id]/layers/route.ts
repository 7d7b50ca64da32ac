import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { addLayer } from "@/lib/pieces/layers";
import { idParam, layerSchema } from "@/lib/validation/pieces";

export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const studio = await requireStaff();
  const body = await parseJson(req, layerSchema);
  return NextResponse.json(addLayer(studio, id, body), { status: 201 });
});
