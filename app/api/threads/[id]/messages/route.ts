import { NextResponse } from "next/server";
import { z } from "zod";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { replyToThread } from "@/lib/messages/service";
import { threadIdParam } from "@/lib/validation/messages";

/** A staff reply on the thread, `{ body }`; the owner is mailed with the thread's Reply-To. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = threadIdParam.parse(ctx.params);
  const out = await replyToThread(await requireStaff(), id, await parseJson(req, z.unknown(), { limit: 64 * 1024 }));
  return NextResponse.json(out, { status: 201 });
});
