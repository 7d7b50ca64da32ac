import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { getClient } from "@/lib/clients/get";
import { updateClient } from "@/lib/clients/update";
import { parseJson, route } from "@/lib/http/route";
import { clientIdParam, clientPatchSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = clientIdParam.parse(ctx.params);
  return NextResponse.json(getClient(await requireStaff(), id));
});

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const { id } = clientIdParam.parse(ctx.params);
  const studio = await requireStaff();
  const patch = await parseJson(req, clientPatchSchema);
  updateClient(studio, id, patch);
  return NextResponse.json(getClient(studio, id));
});
