import { NextResponse } from "next/server";
import { postClaimMessage } from "@/lib/claims/reply";
import { currentViewer } from "@/lib/claims/viewer";
import { parseJson, route } from "@/lib/http/route";
import { claimMessageSchema, idParam } from "@/lib/validation/claims";

/** `{ body, requestInfo? }`; requestInfo (staff) asks the owner for more and sets awaiting_owner. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const out = await postClaimMessage(await currentViewer(), id, await parseJson(req, claimMessageSchema));
  return NextResponse.json(out, { status: 201 });
});
