import { NextResponse } from "next/server";
import { z } from "zod";
import { postClaimMessage } from "@/lib/claims/service";
import { currentViewer } from "@/lib/claims/viewer";
import { parseJson, route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

/** `{ body, requestInfo? }`; requestInfo (staff) asks the owner for more and sets awaiting_owner. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const out = await postClaimMessage(await currentViewer(), id, await parseJson(req, z.unknown()));
  return NextResponse.json(out, { status: 201 });
});
