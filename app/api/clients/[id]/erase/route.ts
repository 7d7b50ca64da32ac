import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { eraseClient } from "@/lib/clients/personal-data";
import { parseJson, route } from "@/lib/http/route";
import { clientIdParam, eraseClientSchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** Admins: erases a client on their request (personal fields, photos); their pieces stay for the warranty record. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = clientIdParam.parse(ctx.params);
  const studio = await requireAdmin();
  await parseJson(req, eraseClientSchema);
  return NextResponse.json({ erased: await eraseClient(studio, id) });
});
