import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { resendReminder } from "@/lib/reminders/staff";
import { ledgerIdSchema } from "@/lib/validation/reminders";

/** POST — send a failed reminder again now. */
export const POST = route({ roles: ["admin", "staff"], params: ledgerIdSchema }, async ({ actor, params }) => {
  const result = await resendReminder(actor, params.id);
  return NextResponse.json(result, { status: result.status === "sent" ? 200 : 502 });
});
