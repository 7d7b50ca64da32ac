import { NextResponse } from "next/server";
import { z } from "zod";
import { route } from "@/lib/http/route";
import { resendReminder } from "@/lib/reminders/staff";

const params = z.object({ id: z.string().min(1).max(64) });

/** POST — send a failed reminder again now. */
export const POST = route({ roles: ["admin", "staff"], params }, async ({ actor, params }) => {
  const result = await resendReminder(actor, params.id);
  return NextResponse.json(result, { status: result.status === "sent" ? 200 : 502 });
});
