import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { resendReminder } from "@/lib/reminders/staff";

/** POST — send a failed reminder again now. */
export const POST = route<{ id: string }>(async (_req, ctx) => {
  const result = await resendReminder(await requireStaff(), ctx.params.id);
  return NextResponse.json(result, { status: result.status === "sent" ? 200 : 502 });
});
