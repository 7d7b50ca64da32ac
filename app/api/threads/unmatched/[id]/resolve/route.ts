import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { resolveUnmatched } from "@/lib/messages/service";
import { threadIdParam } from "@/lib/validation/messages";

/** Staff set aside an e-mail that matched no conversation, once dealt with (it stays on record). */
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const { id } = threadIdParam.parse(ctx.params);
  resolveUnmatched(await requireStaff(), id);
  return NextResponse.json({ ok: true });
});
